import { ChangeDetectionStrategy, Component, inject, signal } from '@angular/core';
import { rxResource } from '@angular/core/rxjs-interop';
import { NonNullableFormBuilder, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatDialog } from '@angular/material/dialog';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { MatSelectModule } from '@angular/material/select';
import { MatTableModule } from '@angular/material/table';
import { Notifier } from '../../../core/notifier';
import { controlMessage } from '../../../shared/form-errors';
import { FormSubmitter } from '../../../shared/form-submit';
import { BenchApi } from '../bench-api';
import { BenchDialog, BenchDialogData } from '../bench-dialog/bench-dialog';
import { Bench, INSTRUMENT_LABELS, OpeningRule, OpeningRuleKind, RULE_KIND_LABELS, RULE_KINDS, WEEKDAYS } from '../bench.models';

const TIME = /^([01]\d|2[0-3]):[0-5]\d$/;

/** Admin: the club's benches and instruments, opening sessions and closures, and booking settings. */
@Component({
  selector: 'rw-benches-page',
  imports: [ReactiveFormsModule, MatTableModule, MatButtonModule, MatIconModule, MatFormFieldModule, MatInputModule, MatSelectModule, MatProgressBarModule],
  changeDetection: ChangeDetectionStrategy.OnPush,
  templateUrl: './benches-page.html',
  styleUrl: './benches-page.scss',
})
export class BenchesPage {
  private readonly api = inject(BenchApi);
  private readonly dialog = inject(MatDialog);
  private readonly notifier = inject(Notifier);
  private readonly fb = inject(NonNullableFormBuilder);
  protected readonly message = controlMessage;
  protected readonly kindLabels = INSTRUMENT_LABELS;
  protected readonly ruleKinds = RULE_KINDS;
  protected readonly ruleKindLabels = RULE_KIND_LABELS;
  protected readonly weekdays = WEEKDAYS;

  protected readonly benches = rxResource({ stream: () => this.api.benches() });
  protected readonly rules = rxResource({ stream: () => this.api.rules() });
  protected readonly ruleColumns = ['kind', 'when', 'times', 'note', 'actions'];
  protected readonly deletingId = signal<number | null>(null);

  protected readonly ruleForm = this.fb.group({
    kind: this.fb.control<OpeningRuleKind>('weekly', Validators.required),
    weekday: this.fb.control<number>(2),
    startTime: ['19:00', [Validators.pattern(TIME)]],
    endTime: ['22:00', [Validators.pattern(TIME)]],
    validFrom: [''],
    validUntil: [''],
    note: ['', [Validators.maxLength(200)]],
  });
  private readonly ruleSubmitter = new FormSubmitter(this.ruleForm);
  protected readonly ruleBusy = this.ruleSubmitter.busy;
  protected readonly ruleError = this.ruleSubmitter.formError;

  protected readonly settingsForm = this.fb.group({
    timeZone: ['', [Validators.required, Validators.maxLength(64)]],
    slotMinutes: [30, [Validators.required, Validators.min(15), Validators.max(240)]],
    maxOpenBookings: [3, [Validators.required, Validators.min(1), Validators.max(50)]],
    horizonDays: [28, [Validators.required, Validators.min(1), Validators.max(365)]],
    cancelCutoffHours: [2, [Validators.required, Validators.min(0), Validators.max(168)]],
  });
  private readonly settingsSubmitter = new FormSubmitter(this.settingsForm);
  protected readonly settingsBusy = this.settingsSubmitter.busy;
  protected readonly settingsError = this.settingsSubmitter.formError;

  constructor() {
    this.api.settings().subscribe((s) => this.settingsForm.setValue(s));
  }

  protected ruleKindLabel(r: OpeningRule): string {
    return RULE_KIND_LABELS[r.kind];
  }

  protected instrumentLine(b: Bench): string {
    return b.instruments
      .map((i) => `${i.name}${i.maxCurrentA ? ` (${i.maxCurrentA} A)` : ''}${i.powerRatingW ? ` (${i.powerRatingW} W)` : ''}`)
      .join(' · ');
  }

  protected editBench(bench: Bench | null): void {
    this.dialog
      .open<BenchDialog, BenchDialogData, Bench>(BenchDialog, { data: { bench }, maxWidth: '96vw' })
      .afterClosed()
      .subscribe((saved) => {
        if (!saved) return;
        this.notifier.info(`${saved.name} saved.`);
        this.benches.reload();
      });
  }

  protected ruleWhen(r: OpeningRule): string {
    const range = (from: string | null, until: string | null) =>
      from && until ? `${from} to ${until}` : from ? `from ${from}` : until ? `until ${until}` : 'every week';
    if (r.kind === 'weekly') return `${WEEKDAYS[(r.weekday ?? 1) - 1]}s, ${range(r.validFrom, r.validUntil)}`;
    if (r.kind === 'one_off') return r.validFrom ?? '';
    return range(r.validFrom, r.validUntil);
  }

  protected addRule(): void {
    const v = this.ruleForm.getRawValue();
    this.ruleSubmitter.submit(
      () =>
        this.api.createRule({
          kind: v.kind,
          weekday: v.kind === 'weekly' ? v.weekday : null,
          startTime: v.kind === 'closure' ? null : v.startTime || null,
          endTime: v.kind === 'closure' ? null : v.endTime || null,
          validFrom: v.validFrom || null,
          validUntil: v.kind === 'one_off' ? null : v.validUntil || null,
          note: v.note.trim() || null,
        }),
      () => {
        this.notifier.info(`${RULE_KIND_LABELS[v.kind]} added.`);
        this.rules.reload();
      },
    );
  }

  protected deleteRule(r: OpeningRule): void {
    this.deletingId.set(r.id);
    this.api.deleteRule(r.id).subscribe({
      next: () => {
        this.deletingId.set(null);
        this.notifier.info(`${RULE_KIND_LABELS[r.kind]} removed. Bookings already made stay.`);
        this.rules.reload();
      },
      error: () => this.deletingId.set(null),
    });
  }

  protected saveSettings(): void {
    this.settingsSubmitter.submit(
      () => this.api.saveSettings(this.settingsForm.getRawValue()),
      () => this.notifier.info('Booking settings saved.'),
    );
  }
}
