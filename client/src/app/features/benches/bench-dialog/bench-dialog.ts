import { ChangeDetectionStrategy, Component, inject } from '@angular/core';
import { FormArray, NonNullableFormBuilder, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatCheckboxModule } from '@angular/material/checkbox';
import { MAT_DIALOG_DATA, MatDialogModule, MatDialogRef } from '@angular/material/dialog';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatSelectModule } from '@angular/material/select';
import { controlMessage } from '../../../shared/form-errors';
import { FormSubmitter } from '../../../shared/form-submit';
import { BenchApi } from '../bench-api';
import { Bench, BenchBody, INSTRUMENT_KINDS, INSTRUMENT_LABELS, Instrument, InstrumentKind } from '../bench.models';

export type BenchDialogData = { bench: Bench | null };

/** Add a bench or edit one: name, place, instruments, out of service. Closes with the saved bench. */
@Component({
  selector: 'rw-bench-dialog',
  imports: [ReactiveFormsModule, MatDialogModule, MatButtonModule, MatCheckboxModule, MatFormFieldModule, MatInputModule, MatSelectModule, MatIconModule],
  changeDetection: ChangeDetectionStrategy.OnPush,
  templateUrl: './bench-dialog.html',
  styles: `
    form { min-width: min(560px, 80vw); }
    .row { display: flex; flex-wrap: wrap; gap: 0 12px; align-items: flex-start; }
    .row > mat-form-field { flex: 1 1 160px; }
    .instrument { border: 1px solid var(--mat-sys-outline-variant); border-radius: 8px; padding: 8px 12px 0; margin-bottom: 8px; }
    fieldset { border: 0; padding: 0; margin: 0 0 8px; min-width: 0; }
    legend { font: var(--mat-sys-title-small); margin-bottom: 4px; }
  `,
})
export class BenchDialog {
  private readonly api = inject(BenchApi);
  private readonly ref = inject<MatDialogRef<BenchDialog, Bench>>(MatDialogRef);
  private readonly fb = inject(NonNullableFormBuilder);
  protected readonly bench = inject<BenchDialogData>(MAT_DIALOG_DATA).bench;
  protected readonly kinds = INSTRUMENT_KINDS;
  protected readonly kindLabels = INSTRUMENT_LABELS;
  protected readonly message = controlMessage;

  protected readonly form = this.fb.group({
    name: [this.bench?.name ?? '', [Validators.required, Validators.maxLength(60)]],
    location: [this.bench?.location ?? '', [Validators.maxLength(120)]],
    instruments: this.fb.array((this.bench?.instruments ?? []).map((i) => this.instrumentGroup(i))),
    outOfService: [this.bench?.outOfService ?? false],
    outOfServiceReason: [this.bench?.outOfServiceReason ?? '', [Validators.maxLength(200)]],
    outOfServiceUntil: [this.bench?.outOfServiceUntil ? this.bench.outOfServiceUntil.slice(0, 10) : ''],
  });
  private readonly submitter = new FormSubmitter(this.form);
  protected readonly busy = this.submitter.busy;
  protected readonly formError = this.submitter.formError;

  protected get instruments(): FormArray {
    return this.form.controls.instruments;
  }

  private instrumentGroup(i?: Instrument) {
    return this.fb.group({
      kind: [i?.kind ?? ('regulated_supply' as InstrumentKind), Validators.required],
      name: [i?.name ?? '', [Validators.required, Validators.maxLength(80)]],
      maxCurrentA: [i?.maxCurrentA ?? (null as number | null), [Validators.min(0.1)]],
      powerRatingW: [i?.powerRatingW ?? (null as number | null), [Validators.min(1)]],
    });
  }

  protected addInstrument(): void {
    this.form.controls.instruments.push(this.instrumentGroup());
  }

  protected removeInstrument(index: number): void {
    this.form.controls.instruments.removeAt(index);
  }

  protected save(): void {
    const v = this.form.getRawValue();
    if (v.outOfService && !v.outOfServiceReason.trim()) {
      this.form.controls.outOfServiceReason.setErrors({ server: 'Say why the bench is out of service.' });
      this.form.controls.outOfServiceReason.markAsTouched();
    }
    const body: BenchBody = {
      name: v.name.trim(),
      location: v.location.trim() || null,
      instruments: v.instruments.map((i) => ({
        kind: i.kind,
        name: i.name.trim(),
        maxCurrentA: i.kind === 'regulated_supply' ? i.maxCurrentA : null,
        powerRatingW: i.kind === 'dummy_load' ? i.powerRatingW : null,
      })),
      outOfService: v.outOfService,
      outOfServiceReason: v.outOfService ? v.outOfServiceReason.trim() || null : null,
      // A date is read as the end of that day in UTC: the bench is back the day after.
      outOfServiceUntil: v.outOfService && v.outOfServiceUntil ? `${v.outOfServiceUntil}T23:59:59Z` : null,
    };
    this.submitter.submit(
      () => (this.bench ? this.api.updateBench(this.bench.id, body) : this.api.createBench(body)),
      (saved) => this.ref.close(saved),
    );
  }
}
