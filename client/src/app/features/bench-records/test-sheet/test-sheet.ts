import { DatePipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, computed, inject, input, output, signal } from '@angular/core';
import { rxResource, toSignal } from '@angular/core/rxjs-interop';
import { FormArray, NonNullableFormBuilder, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatCardModule } from '@angular/material/card';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatPaginatorModule, PageEvent } from '@angular/material/paginator';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { evaluateTestSheet, MAX_BANDS, type TestSheetResult } from '@domain/test-sheet';
import { SessionStore } from '../../../core/auth/session-store';
import { Caution } from '../../../shared/caution/caution';
import { controlMessage } from '../../../shared/form-errors';
import { FormSubmitter } from '../../../shared/form-submit';
import { TicketDetail } from '../../tickets/ticket.models';
import { BenchRecordsApi } from '../bench-records-api';
import { bandLineValidator, mhzToHz } from '../bench-records-forms';
import { TestSheetBody } from '../bench-records.models';

/** A figure with a fixed precision, or a dash. */
export function fixed(value: number | null | undefined, digits: number): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return '—';
  const text = value.toFixed(digits);
  return Number(text) === 0 ? (0).toFixed(digits) : text.replace('-', '−');
}

/** A figure with its sign: +0.56, −0.22, 0.00. */
export function signed(value: number | null | undefined, digits: number): string {
  const text = fixed(value, digits);
  return text !== '—' && Number(value!.toFixed(digits)) > 0 ? `+${text}` : text;
}

/** The Bench test lane's record: the RF caution, the sheet form with live figures, and every sheet with its report. */
@Component({
  selector: 'rw-test-sheet',
  imports: [
    ReactiveFormsModule,
    DatePipe,
    Caution,
    MatButtonModule,
    MatCardModule,
    MatFormFieldModule,
    MatIconModule,
    MatInputModule,
    MatPaginatorModule,
    MatProgressBarModule,
  ],
  changeDetection: ChangeDetectionStrategy.OnPush,
  templateUrl: './test-sheet.html',
  styleUrl: './test-sheet.scss',
})
export class TestSheetSection {
  readonly ticket = input.required<TicketDetail>();
  /** A sheet was saved (the ticket may have moved to Repair: reload it). */
  readonly recorded = output<void>();

  private readonly api = inject(BenchRecordsApi);
  private readonly fb = inject(NonNullableFormBuilder);
  protected readonly session = inject(SessionStore);
  protected readonly message = controlMessage;
  protected readonly fixed = fixed;
  protected readonly signed = signed;
  protected readonly maxBands = MAX_BANDS;

  private readonly revision = signal(0);
  protected readonly page = signal({ index: 0, size: 5 });
  protected readonly sheets = rxResource({
    params: () => ({ tag: this.ticket().tag, revision: this.revision(), page: this.page() }),
    stream: ({ params }) => this.api.testSheets(params.tag, { page: params.page.index + 1, pageSize: params.page.size }),
  });
  protected readonly limits = rxResource({ stream: () => this.api.limits() });
  protected readonly canRecord = computed(() => this.session.worksTheBench() && this.sheets.hasValue() && this.sheets.value().canRecord);

  protected readonly form = this.fb.group({
    supplyVoltageV: [null as number | null, [Validators.required, Validators.min(0.1), Validators.max(60)]],
    receiveCurrentA: [null as number | null, [Validators.required, Validators.min(0), Validators.max(100)]],
    reference: ['', [Validators.maxLength(200)]],
    notes: ['', [Validators.maxLength(2000)]],
    bands: this.fb.array([this.bandGroup('20 m')]),
  });
  protected readonly submitter = new FormSubmitter(this.form, { invalidMessage: 'Some readings need attention: see the marked fields.' });
  protected readonly saved = signal('');
  private readonly value = toSignal(this.form.valueChanges, { initialValue: this.form.getRawValue() });

  protected get bands(): FormArray {
    return this.form.controls.bands;
  }

  bandGroup(band = '') {
    return this.fb.group(
      {
        band: [band, [Validators.required, Validators.maxLength(20)]],
        ratedW: [null as number | null, [Validators.required, Validators.min(0.001), Validators.max(10000)]],
        forwardW: [null as number | null, [Validators.required, Validators.min(0.001), Validators.max(10000)]],
        reflectedW: [null as number | null, [Validators.required, Validators.min(0), Validators.max(10000)]],
        nominalMHz: [null as number | null, [Validators.min(0.001)]],
        measuredMHz: [null as number | null, [Validators.min(0.001)]],
      },
      { validators: bandLineValidator },
    );
  }

  protected addBand(): void {
    if (this.bands.length < MAX_BANDS) this.bands.push(this.bandGroup(''));
  }

  protected removeBand(i: number): void {
    if (this.bands.length > 1) this.bands.removeAt(i);
  }

  /** The body as the API wants it (MHz typed, Hz sent). */
  body(): TestSheetBody {
    const v = this.form.getRawValue();
    return {
      supplyVoltageV: Number(v.supplyVoltageV),
      receiveCurrentA: Number(v.receiveCurrentA),
      reference: v.reference.trim() || null,
      notes: v.notes.trim() || null,
      bands: v.bands.map((b) => ({
        band: b.band.trim(),
        ratedW: Number(b.ratedW),
        forwardW: Number(b.forwardW),
        reflectedW: Number(b.reflectedW),
        nominalHz: mhzToHz(b.nominalMHz),
        measuredHz: mhzToHz(b.measuredMHz),
      })),
    };
  }

  /** The figures and the verdict as typed, through the same domain function the server uses; null until the readings add up. */
  protected readonly preview = computed<TestSheetResult | null>(() => {
    this.value();
    if (!this.limits.hasValue() || this.form.invalid) return null;
    try {
      return evaluateTestSheet(this.body(), this.limits.value().limits);
    } catch {
      return null;
    }
  });

  protected save(): void {
    this.submitter.submit(
      () => this.api.saveTestSheet(this.ticket().tag, this.body()),
      (res) => {
        const n = res.sheet.number;
        this.saved.set(
          res.sheet.passed
            ? `Test sheet ${n} passed.${res.mailed ? ' The report is on its way to the owner by e-mail.' : ''} The ticket may now go to Return.`
            : res.movedTo === 'repair'
              ? `Test sheet ${n} failed; the ticket went back to Repair with the failed lines as the reason.`
              : `Test sheet ${n} failed. ${res.moveRefused ?? ''}`,
        );
        this.form.reset();
        while (this.bands.length > 1) this.bands.removeAt(1);
        this.page.set({ index: 0, size: this.page().size });
        this.revision.update((r) => r + 1);
        this.recorded.emit();
      },
    );
  }

  protected paged(e: PageEvent): void {
    this.page.set({ index: e.pageIndex, size: e.pageSize });
  }

  protected bandMessage(i: number, field: string, label: string): string {
    const group = this.bands.at(i);
    const control = group.get(field)!;
    return controlMessage(control, label);
  }
}
