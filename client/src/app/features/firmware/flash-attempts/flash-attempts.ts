import { DatePipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, computed, effect, inject, input, output, signal, untracked } from '@angular/core';
import { rxResource, takeUntilDestroyed, toSignal } from '@angular/core/rxjs-interop';
import { NonNullableFormBuilder, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatCardModule } from '@angular/material/card';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { MatRadioModule } from '@angular/material/radio';
import { MatSelectModule } from '@angular/material/select';
import { RouterLink } from '@angular/router';
import { SERIAL_BAUDS, planXmodemTransfer } from '@domain/xmodem';
import { debounceTime, distinctUntilChanged, map } from 'rxjs';
import { readApiError } from '../../../core/http/api-error';
import { Caution } from '../../../shared/caution/caution';
import { applyServerErrors, controlMessage } from '../../../shared/form-errors';
import { TicketDetail } from '../../tickets/ticket.models';
import { FirmwareApi } from '../firmware-api';
import { atLeast, rateText, sizeText } from '../firmware-format';
import {
  FIRMWARE_UNITS,
  FIRMWARE_UNIT_LABELS,
  FLASH_OUTCOMES,
  FLASH_OUTCOME_LABELS,
  FirmwareUnit,
  FlashOutcome,
  SERIAL_PARITIES,
  SERIAL_STOP_BITS,
  TrackRecordRow,
} from '../firmware.models';

export const OUTCOME_ICONS: Record<FlashOutcome, string> = {
  bootloader_not_entered: 'do_not_disturb_on',
  transfer_failed: 'error',
  transfer_completed: 'download_done',
  verified_running: 'verified',
};

/** The ticket's units in words → the library's unit, for a first guess in the form. */
export function guessUnit(units: readonly string[]): FirmwareUnit {
  const text = units.join(' ').toLowerCase();
  if (/display|head|front panel|control head/.test(text) && !/main|body|board/.test(text)) return 'display_head';
  return 'main_board';
}

/** Flash attempts on a ticket: the reflash cautions, the form from the Reflash lane, the transfer plan, what worked before, and every attempt. */
@Component({
  selector: 'rw-flash-attempts',
  imports: [
    ReactiveFormsModule,
    RouterLink,
    DatePipe,
    Caution,
    MatButtonModule,
    MatCardModule,
    MatFormFieldModule,
    MatIconModule,
    MatInputModule,
    MatProgressBarModule,
    MatRadioModule,
    MatSelectModule,
  ],
  changeDetection: ChangeDetectionStrategy.OnPush,
  templateUrl: './flash-attempts.html',
  styleUrl: './flash-attempts.scss',
})
export class FlashAttempts {
  readonly ticket = input.required<TicketDetail>();
  /** An attempt was recorded (the ticket's moves may have changed: reload it). */
  readonly recorded = output<void>();

  private readonly api = inject(FirmwareApi);
  private readonly tag = computed(() => this.ticket().tag);
  private readonly fb = inject(NonNullableFormBuilder);

  protected readonly units = FIRMWARE_UNITS;
  protected readonly unitLabels = FIRMWARE_UNIT_LABELS;
  protected readonly outcomes = FLASH_OUTCOMES;
  protected readonly outcomeLabels = FLASH_OUTCOME_LABELS;
  protected readonly outcomeIcons = OUTCOME_ICONS;
  protected readonly bauds = SERIAL_BAUDS;
  protected readonly parities = SERIAL_PARITIES;
  protected readonly stopBits = SERIAL_STOP_BITS;
  protected readonly sizeText = sizeText;
  protected readonly rateText = rateText;
  protected readonly message = controlMessage;

  protected readonly search = this.fb.control('');
  private readonly q = toSignal(this.search.valueChanges.pipe(debounceTime(300), map((v) => v.trim()), distinctUntilChanged()), { initialValue: '' });
  protected readonly view = rxResource({
    params: () => ({ tag: this.tag(), q: this.q() }),
    stream: ({ params }) => this.api.attempts(params.tag, params.q),
  });

  protected readonly form = this.fb.group({
    unit: ['main_board' as FirmwareUnit, [Validators.required]],
    firmwareId: [0, [Validators.min(1)]],
    port: ['', [Validators.required, Validators.maxLength(60)]],
    baud: [115200, [Validators.required]],
    dataBits: [8, [Validators.required]],
    parity: ['none' as (typeof SERIAL_PARITIES)[number]],
    stopBits: ['1' as (typeof SERIAL_STOP_BITS)[number]],
    block: [128 as 128 | 1024],
    check: ['crc' as 'crc' | 'sum'],
    outcome: ['' as FlashOutcome | '', [Validators.required]],
    failedAtBlock: [null as number | null],
    notes: ['', [Validators.maxLength(4000)]],
  });
  protected readonly value = toSignal(this.form.valueChanges, { initialValue: this.form.getRawValue() });
  protected readonly unit = computed(() => this.value().unit ?? 'main_board');

  protected readonly record = rxResource({
    params: () => ({ model: this.ticket().makeModel, unit: this.unit() }),
    stream: ({ params }) => this.api.trackRecord(params.model, params.unit),
  });
  protected readonly choices = computed<TrackRecordRow[]>(() => (this.record.hasValue() ? this.record.value().images.filter((i) => !i.withdrawn) : []));
  protected readonly withdrawn = computed<TrackRecordRow[]>(() => (this.record.hasValue() ? this.record.value().images.filter((i) => i.withdrawn) : []));
  protected readonly chosen = computed(() => this.choices().find((i) => i.firmwareId === this.value().firmwareId) ?? null);

  /** The XMODEM plan for the chosen image and settings (api/src/domain/xmodem.ts, the same function the API uses). */
  protected readonly plan = computed(() => {
    const image = this.chosen();
    const v = this.value();
    if (!image) return null;
    try {
      return planXmodemTransfer({ bytes: image.size, block: v.block ?? 128, check: v.check ?? 'crc', baud: Number(v.baud ?? 115200) });
    } catch {
      return null;
    }
  });
  protected readonly failedShare = computed(() => {
    const plan = this.plan();
    const n = Number(this.value().failedAtBlock);
    if (!plan || !Number.isInteger(n) || n < 1 || n > plan.blocks) return null;
    return Math.round(((n - 1) / plan.blocks) * 1000) / 10;
  });

  protected readonly serialLog = signal<File | null>(null);
  protected readonly logError = signal('');
  protected readonly busy = signal(false);
  protected readonly formError = signal('');
  protected readonly saved = signal('');

  constructor() {
    // First guess of the unit from the ticket's own words; the technician can change it.
    effect(() => {
      this.tag();
      untracked(() => this.form.controls.unit.setValue(guessUnit(this.ticket().units)));
    });
    // A new unit means a new image list: the choice must be made again.
    this.form.controls.unit.valueChanges.pipe(takeUntilDestroyed()).subscribe(() => this.form.controls.firmwareId.setValue(0));
    // Preselect the first image of the list (known good first, then what worked most).
    effect(() => {
      const first = this.choices()[0];
      if (first && !this.choices().some((c) => c.firmwareId === this.form.controls.firmwareId.value)) {
        this.form.controls.firmwareId.setValue(first.firmwareId);
      }
    });
  }

  protected chooseLog(input: HTMLInputElement): void {
    const file = input.files?.[0] ?? null;
    this.logError.set(file && file.size > 256 * 1024 ? 'The serial log is larger than 256 KiB. Keep the part around the transfer.' : '');
    this.serialLog.set(file);
  }

  protected submit(): void {
    this.formError.set('');
    this.saved.set('');
    const v = this.form.getRawValue();
    const plan = this.plan();
    const failed = v.outcome === 'transfer_failed';
    if (failed && !(Number.isInteger(Number(v.failedAtBlock)) && Number(v.failedAtBlock) >= 1 && plan && Number(v.failedAtBlock) <= plan.blocks)) {
      this.form.controls.failedAtBlock.setErrors({ server: plan ? `Give the failed block, 1 to ${plan.blocks}.` : 'Give the failed block.' });
    }
    if (!v.firmwareId) this.form.controls.firmwareId.setErrors({ server: 'Choose an image from the list.' });
    if (this.form.invalid || this.logError()) {
      this.form.markAllAsTouched();
      this.formError.set('Some fields need attention: see the messages under them.');
      return;
    }
    this.busy.set(true);
    this.api
      .recordAttempt(
        this.ticket().tag,
        {
          unit: v.unit,
          firmwareId: v.firmwareId,
          port: v.port.trim(),
          baud: Number(v.baud),
          dataBits: Number(v.dataBits),
          parity: v.parity,
          stopBits: v.stopBits,
          block: v.block,
          check: v.check,
          outcome: v.outcome as FlashOutcome,
          ...(failed ? { failedAtBlock: Number(v.failedAtBlock) } : {}),
          ...(v.notes.trim() ? { notes: v.notes.trim() } : {}),
        },
        this.serialLog(),
      )
      .subscribe({
        next: (view) => {
          this.busy.set(false);
          this.view.value.set(view);
          const last = view.attempts.at(-1);
          this.saved.set(last ? `Attempt ${last.number} recorded: ${FLASH_OUTCOME_LABELS[last.outcome]}.` : 'Attempt recorded.');
          this.form.patchValue({ outcome: '', failedAtBlock: null, notes: '' });
          this.form.markAsUntouched();
          this.serialLog.set(null);
          this.record.reload();
          this.recorded.emit();
        },
        error: (err: unknown) => {
          this.busy.set(false);
          const e = readApiError(err);
          const { serialLog, ...rest } = e.fields;
          if (serialLog) this.logError.set(serialLog);
          applyServerErrors(this.form, rest);
          this.formError.set(e.message);
        },
      });
  }

  protected logUrl(number: number): string {
    return this.api.serialLogUrl(this.ticket().tag, number);
  }

  protected atLeast = atLeast;
}
