import { DatePipe, DecimalPipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, computed, effect, inject, input, output, signal, untracked } from '@angular/core';
import { rxResource, toSignal } from '@angular/core/rxjs-interop';
import { FormGroup, NonNullableFormBuilder, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatCardModule } from '@angular/material/card';
import { MatCheckboxModule } from '@angular/material/checkbox';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { MatRadioModule } from '@angular/material/radio';
import { MatSelectModule } from '@angular/material/select';
import {
  DIAGNOSIS_CHECKS,
  DIAGNOSIS_CHECK_LABELS,
  DIAGNOSIS_DECISIONS,
  DIAGNOSIS_DECISION_LABELS,
  type DiagnosisCheck,
  type DiagnosisDecision,
  type DiagnosisRecord,
} from '@contracts/owner-records';
import { AWG_GAUGES, DEFAULT_TOLERANCE_PCT, MM2_GAUGES, NOMINAL_SUPPLY_V, dcLeadDrop, isAwgGauge, isMm2Gauge, type DcLeadDrop, type LeadGauge } from '@domain/dc-lead';
import { startWith } from 'rxjs';
import { readApiError } from '../../../core/http/api-error';
import { Notifier } from '../../../core/notifier';
import { Caution } from '../../../shared/caution/caution';
import { applyServerErrors } from '../../../shared/form-errors';
import { TicketDetail } from '../../tickets/ticket.models';
import { OwnerRecordsApi } from '../owner-records-api';
import { measurementValidator, optionalNumber, recordFieldMessage } from '../record-forms';

/** Gauge choices as one select, as on the calculators page: "awg:12" or "mm2:2.5". */
const GAUGE_CHOICES = [...AWG_GAUGES.map((g) => ({ value: `awg:${g}`, label: `AWG ${g}` })), ...MM2_GAUGES.map((g) => ({ value: `mm2:${g}`, label: `${g} mm²` }))];

/** Whether the lead, at the measured current, explains a "low voltage at the radio" fault. */
export interface LeadVerdict {
  drop: DcLeadDrop;
  /** The supply itself is inside the band, but the voltage left at the radio is below it. */
  explainsLowVoltage: boolean;
  currentA: number;
}

/** Reads the lead calculator from the form's texts; null when something is missing or out of range. */
export function leadVerdict(v: { lengthM: string; gauge: string; sourceV: string; transmitCurrentA: string; idleCurrentA: string }): LeadVerdict | null {
  const lengthM = optionalNumber(v.lengthM);
  const sourceV = optionalNumber(v.sourceV);
  const currentA = optionalNumber(v.transmitCurrentA) ?? optionalNumber(v.idleCurrentA);
  const [unit, size] = v.gauge.split(':');
  const n = Number(size);
  const gauge: LeadGauge | null = unit === 'awg' && isAwgGauge(n) ? { awg: n } : unit === 'mm2' && isMm2Gauge(n) ? { mm2: n } : null;
  if (lengthM === null || sourceV === null || currentA === null || !gauge) return null;
  try {
    const drop = dcLeadDrop({ currentA, lengthM, gauge, supplyV: sourceV });
    const supplyInBand = sourceV >= drop.minV && sourceV <= drop.maxV;
    return { drop, currentA, explainsLowVoltage: supplyInBand && drop.voltageAtRadioV < drop.minV };
  } catch {
    return null;
  }
}

/** The diagnosis record on the ticket page: first checks, measurements, the DC lead, findings, decision; and reflash consent. */
@Component({
  selector: 'rw-diagnosis-section',
  imports: [
    ReactiveFormsModule,
    DatePipe,
    DecimalPipe,
    Caution,
    MatCardModule,
    MatButtonModule,
    MatCheckboxModule,
    MatFormFieldModule,
    MatIconModule,
    MatInputModule,
    MatProgressBarModule,
    MatRadioModule,
    MatSelectModule,
  ],
  changeDetection: ChangeDetectionStrategy.OnPush,
  templateUrl: './diagnosis-section.html',
  styleUrl: '../owner-records.scss',
})
export class DiagnosisSection {
  readonly ticket = input.required<TicketDetail>();
  /** Emitted after a save or a consent, so the page reloads the ticket (timeline, moves). */
  readonly changed = output<void>();

  private readonly api = inject(OwnerRecordsApi);
  private readonly notifier = inject(Notifier);
  private readonly fb = inject(NonNullableFormBuilder);

  protected readonly checkKeys = DIAGNOSIS_CHECKS;
  protected readonly checkLabels = DIAGNOSIS_CHECK_LABELS;
  protected readonly decisions = DIAGNOSIS_DECISIONS;
  protected readonly decisionLabels = DIAGNOSIS_DECISION_LABELS;
  protected readonly gauges = GAUGE_CHOICES;
  protected readonly nominalV = NOMINAL_SUPPLY_V;
  protected readonly tolerancePct = DEFAULT_TOLERANCE_PCT;
  protected readonly message = recordFieldMessage;

  protected readonly record = rxResource({ params: () => this.ticket().tag, stream: ({ params }) => this.api.diagnosis(params) });

  protected readonly form = this.fb.group({
    checks: this.fb.group(
      Object.fromEntries(DIAGNOSIS_CHECKS.map((k) => [k, this.fb.group({ done: false, result: ['', [Validators.maxLength(200)]] })])) as Record<
        DiagnosisCheck,
        FormGroup
      >,
    ),
    supplyAtRadioV: ['', [measurementValidator(60, 'V')]],
    idleCurrentA: ['', [measurementValidator(100, 'A')]],
    transmitCurrentA: ['', [measurementValidator(100, 'A')]],
    lengthM: ['', [measurementValidator(100, 'm')]],
    gauge: 'awg:12',
    sourceV: [String(NOMINAL_SUPPLY_V), [measurementValidator(60, 'V')]],
    findings: ['', [Validators.maxLength(4000)]],
    decision: this.fb.control<DiagnosisDecision | ''>(''),
    returnReason: ['', [Validators.maxLength(500)]],
  });

  private readonly values = toSignal(this.form.valueChanges.pipe(startWith(null)));
  protected readonly lead = computed(() => {
    this.values();
    const v = this.form.getRawValue();
    return leadVerdict(v);
  });
  protected readonly saving = signal(false);
  protected readonly error = signal('');
  protected readonly consentForm = this.fb.group({ method: this.fb.control<'phone' | 'in_person'>('phone'), note: ['', [Validators.maxLength(500)]] });
  protected readonly consenting = signal(false);

  constructor() {
    // Fill the form from the saved record (once per load).
    effect(() => {
      if (!this.record.hasValue()) return;
      const r = this.record.value();
      untracked(() => this.fill(r));
    });
  }

  private fill(r: DiagnosisRecord): void {
    const text = (n: number | null) => (n === null ? '' : String(n));
    this.form.reset({
      checks: Object.fromEntries(DIAGNOSIS_CHECKS.map((k) => [k, { done: r.checks[k].done, result: r.checks[k].result ?? '' }])),
      supplyAtRadioV: text(r.supplyAtRadioV),
      idleCurrentA: text(r.idleCurrentA),
      transmitCurrentA: text(r.transmitCurrentA),
      lengthM: r.lead ? String(r.lead.lengthM) : '',
      gauge: r.lead?.gauge ?? 'awg:12',
      sourceV: r.lead ? String(r.lead.sourceV) : String(NOMINAL_SUPPLY_V),
      findings: r.findings ?? '',
      decision: r.decision ?? '',
      returnReason: r.returnReason ?? '',
    });
    if (!r.editable) this.form.disable();
    else this.form.enable();
  }

  protected save(): void {
    const r = this.record.value();
    if (!r || this.saving()) return;
    const v = this.form.getRawValue();
    if (v.decision === 'return_unrepaired' && v.returnReason.trim().length < 3) {
      this.form.controls.returnReason.setErrors({ server: 'Say why it goes back unrepaired (no fault found, unrepairable, owner declined).' });
      this.form.controls.returnReason.markAsTouched();
    }
    if (this.form.invalid) {
      this.form.markAllAsTouched();
      this.error.set('Some fields need attention: see the messages under them.');
      return;
    }
    const lengthM = optionalNumber(v.lengthM);
    const sourceV = optionalNumber(v.sourceV);
    this.error.set('');
    this.saving.set(true);
    this.api
      .saveDiagnosis(r.tag, {
        version: r.version,
        checks: Object.fromEntries(DIAGNOSIS_CHECKS.map((k) => [k, { done: !!v.checks[k]['done'], result: String(v.checks[k]['result'] ?? '').trim() || null }])) as DiagnosisRecord['checks'],
        supplyAtRadioV: optionalNumber(v.supplyAtRadioV),
        idleCurrentA: optionalNumber(v.idleCurrentA),
        transmitCurrentA: optionalNumber(v.transmitCurrentA),
        lead: lengthM !== null && sourceV !== null ? { lengthM, gauge: v.gauge, sourceV } : null,
        findings: v.findings.trim() || null,
        decision: v.decision || null,
        returnReason: v.decision === 'return_unrepaired' ? v.returnReason.trim() : null,
      })
      .subscribe({
        next: (saved) => {
          this.record.value.set(saved);
          this.saving.set(false);
          this.notifier.info('Diagnosis saved.');
          this.changed.emit();
        },
        error: (err: unknown) => {
          const e = readApiError(err);
          this.saving.set(false);
          const unplaced = e.fields ? applyServerErrors(this.form, e.fields) : [];
          this.error.set(unplaced.length ? unplaced.join(' ') : e.message);
          if (e.status === 409) this.record.reload();
        },
      });
  }

  protected recordConsent(): void {
    if (this.consenting() || this.consentForm.invalid) return;
    const v = this.consentForm.getRawValue();
    this.consenting.set(true);
    this.api.recordConsent(this.ticket().tag, { method: v.method, ...(v.note.trim() ? { note: v.note.trim() } : {}) }).subscribe({
      next: () => {
        this.consenting.set(false);
        this.notifier.info('Consent to a reflash recorded.');
        this.changed.emit();
      },
      error: (err: unknown) => {
        this.consenting.set(false);
        this.error.set(readApiError(err).message);
      },
    });
  }
}
