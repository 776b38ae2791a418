import { DatePipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, DestroyRef, computed, inject, signal } from '@angular/core';
import { rxResource, takeUntilDestroyed } from '@angular/core/rxjs-interop';
import { FormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatCardModule } from '@angular/material/card';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { MatRadioModule } from '@angular/material/radio';
import { MatSelectModule } from '@angular/material/select';
import { ActivatedRoute, Router, RouterLink } from '@angular/router';
import type { PracticeUnitEvent } from '@domain/practice-unit';
import { SERIAL_BAUDS, planXmodemTransfer, type XmodemBlockSize } from '@domain/xmodem';
import { from, map, switchMap } from 'rxjs';
import { readApiError } from '../../../core/http/api-error';
import { Caution } from '../../../shared/caution/caution';
import { FirmwareApi } from '../../firmware/firmware-api';
import { atLeast, sizeText } from '../../firmware/firmware-format';
import { FIRMWARE_UNITS, FIRMWARE_UNIT_LABELS, FLASH_OUTCOME_LABELS, type FirmwareUnit, type FlashOutcome, type TrackRecordRow } from '../../firmware/firmware.models';
import { OUTCOME_ICONS } from '../../firmware/flash-attempts/flash-attempts';
import { TicketApi } from '../../tickets/ticket-api';
import type { FlashRun } from '../flash-run';
import { FlashTerminal, type TypedBytes } from '../flash-terminal/flash-terminal';
import { FlasherApi } from '../flasher-api';
import {
  attemptOf,
  checkImage,
  cleanLog,
  forgetPendingRun,
  keepPendingRun,
  loadPendingRun,
  offerableImages,
  terminalText,
  unitChoices,
  type PendingRun,
} from '../flasher-record';
import { openPracticeLink } from '../practice-link';
import { RecordedRun } from '../recorded-run';
import { NO_FAULTS, PracticePanel, practiceSessionOptions, type PracticeFaultsForm } from '../practice-panel/practice-panel';
import { DEFAULT_SERIAL_SETTINGS, describeSerial, type SerialLink, type SerialSettings } from '../serial-link';
import { openWebSerialLink, webSerialUnavailableReason } from '../web-serial-link';

type SaveState =
  | { kind: 'idle' }
  | { kind: 'saving'; what: string }
  | { kind: 'saved'; number: number; outcome: FlashOutcome; tag: string }
  | { kind: 'error'; message: string };

const TERMINAL_MAX_CHARS = 60_000;

/** The Flasher: reflash a unit over its serial bootloader (or the practice unit), every run recorded as a flash attempt. */
@Component({
  selector: 'rw-flasher-page',
  imports: [
    DatePipe,
    FormsModule,
    RouterLink,
    Caution,
    FlashTerminal,
    PracticePanel,
    MatButtonModule,
    MatCardModule,
    MatFormFieldModule,
    MatIconModule,
    MatProgressBarModule,
    MatRadioModule,
    MatSelectModule,
  ],
  changeDetection: ChangeDetectionStrategy.OnPush,
  templateUrl: './flasher-page.html',
  styleUrl: './flasher-page.scss',
})
export class FlasherPage {
  private readonly route = inject(ActivatedRoute);
  private readonly router = inject(Router);
  private readonly tickets = inject(TicketApi);
  private readonly firmware = inject(FirmwareApi);
  private readonly api = inject(FlasherApi);

  protected readonly unitLabels = FIRMWARE_UNIT_LABELS;
  protected readonly outcomeLabels = FLASH_OUTCOME_LABELS;
  protected readonly outcomeIcons = OUTCOME_ICONS;
  protected readonly bauds = SERIAL_BAUDS.filter((b) => b >= 9600);
  protected readonly sizeText = sizeText;
  protected readonly atLeast = atLeast;
  protected readonly describeSerial = describeSerial;
  /** Why a real port cannot be used here (insecure page, browser without Web Serial), or null. */
  protected readonly serialUnavailable = webSerialUnavailableReason();

  // What to flash
  protected readonly tag = signal(this.route.snapshot.queryParamMap.get('ticket') ?? '');
  protected readonly reflashTickets = rxResource({ stream: () => this.api.reflashTickets() });
  protected readonly ticketList = computed(() => (this.reflashTickets.hasValue() ? this.reflashTickets.value() : []));
  private readonly ticketNow = computed(() => (this.ticket.hasValue() ? this.ticket.value() : null));
  protected readonly ticket = rxResource({
    params: () => this.tag() || undefined,
    stream: ({ params }) => this.tickets.get(params),
  });
  protected readonly attempts = rxResource({
    params: () => this.tag() || undefined,
    stream: ({ params }) => this.firmware.attempts(params),
  });
  protected readonly units = computed(() => (this.ticket.hasValue() ? unitChoices(this.ticket.value().units, FIRMWARE_UNITS) : []));
  protected readonly unit = signal<FirmwareUnit | null>(null);
  private readonly chosenUnit = computed(() => this.unit() ?? this.units()[0]?.unit ?? null);
  protected readonly record = rxResource({
    params: () => (this.ticket.hasValue() && this.chosenUnit() ? { model: this.ticket.value().makeModel, unit: this.chosenUnit()! } : undefined),
    stream: ({ params }) => this.firmware.trackRecord(params.model, params.unit),
  });
  protected readonly images = computed(() => (this.record.hasValue() ? offerableImages(this.record.value().images) : []));
  protected readonly withdrawnCount = computed(() => (this.record.hasValue() ? this.record.value().images.length - this.images().length : 0));
  protected readonly firmwareId = signal<number | null>(null);
  protected readonly image = computed<TrackRecordRow | null>(() => this.images().find((i) => i.firmwareId === this.firmwareId()) ?? this.images()[0] ?? null);
  /** The image's bytes, fetched and checked against the library's SHA-256 before anything is sent. */
  protected readonly checked = rxResource({
    params: () => this.image() ?? undefined,
    stream: ({ params: image }) =>
      this.api.imageBytes(image.firmwareId).pipe(
        switchMap((bytes) => from(checkImage(bytes, image)).pipe(map((check) => ({ check, bytes, image })))),
      ),
  });
  protected readonly checkError = computed(() => {
    if (this.checked.error()) return `The image could not be fetched or checked: ${readApiError(this.checked.error()).message}`;
    const c = this.checked.hasValue() ? this.checked.value().check : null;
    if (c?.ok === 'unchecked' && this.portKind() === 'practice') return '';
    return c && c.ok !== true ? c.message : '';
  });
  /** The checked image, ready to send (unchecked only for the practice unit on a page without SubtleCrypto). */
  protected readonly verifiedImage = computed(() => {
    if (!this.checked.hasValue()) return null;
    const v = this.checked.value();
    const usable = v.check.ok === true || (v.check.ok === 'unchecked' && this.portKind() === 'practice');
    return usable && v.image.firmwareId === this.image()?.firmwareId ? v : null;
  });
  protected readonly checkedSha = computed(() => {
    const c = this.verifiedImage()?.check;
    return c && c.ok === true ? c.sha256 : null;
  });

  // Serial settings and the port
  protected readonly portKind = signal<'web-serial' | 'practice'>(this.serialUnavailable ? 'practice' : 'web-serial');
  protected readonly settings = signal<SerialSettings>({ ...DEFAULT_SERIAL_SETTINGS });
  protected readonly block = signal<XmodemBlockSize>(128);
  protected readonly faults = signal<PracticeFaultsForm>({ ...NO_FAULTS });
  protected readonly link = signal<SerialLink | null>(null);
  protected readonly opening = signal(false);
  protected readonly portError = signal('');
  protected readonly practiceReport = signal('');
  protected readonly plan = computed(() => {
    const image = this.image();
    return image ? planXmodemTransfer({ bytes: image.size, block: this.block(), check: 'crc', baud: this.settings().baudRate }) : null;
  });

  // The terminal and the run
  protected readonly screen = signal('');
  /** Everything since the port opened (unit text and the keys sent), for the serial logs. */
  private sessionLog = '';
  /** Where the log of the next attempt starts in sessionLog. */
  private logMark = 0;
  protected readonly run = signal<FlashRun | null>(null);
  protected readonly progress = computed(() => this.run()?.progress() ?? null);
  protected readonly running = computed(() => !!this.run() && !this.progress()?.outcome);
  private recorded: RecordedRun | null = null;
  protected readonly save = signal<SaveState>({ kind: 'idle' });
  protected readonly saving = computed(() => { const s = this.save(); return s.kind === 'saving' ? s : null; });
  protected readonly saved = computed(() => { const s = this.save(); return s.kind === 'saved' ? s : null; });
  protected readonly saveError = computed(() => { const s = this.save(); return s.kind === 'error' ? s : null; });
  /** The last run that ended with the transfer completed and was saved: it may be marked verified running. */
  protected readonly completed = signal<{ pending: PendingRun; number: number } | null>(null);
  protected readonly verified = signal<number | null>(null);
  /** A run left unsaved by an earlier visit (page reloaded or closed mid-run, or saving failed). */
  protected readonly recovered = signal<PendingRun | null>(loadPendingRun());

  protected readonly canSend = computed(
    () => !!this.link() && !!this.verifiedImage() && !this.running() && this.attempts.hasValue() && this.attempts.value().canRecord && this.save().kind !== 'saving',
  );

  constructor() {
    inject(DestroyRef).onDestroy(() => {
      this.run()?.cancel('The Flasher page was left during the run.');
      this.recorded?.stopKeeping();
      void this.link()?.close();
    });
    this.route.queryParamMap.pipe(takeUntilDestroyed()).subscribe((q) => {
      const t = q.get('ticket') ?? '';
      if (t !== this.tag()) this.chooseTicket(t, false);
    });
  }

  protected chooseTicket(tag: string, navigate = true): void {
    this.tag.set(tag);
    this.unit.set(null);
    this.firmwareId.set(null);
    this.completed.set(null);
    this.verified.set(null);
    this.save.set({ kind: 'idle' });
    if (navigate) void this.router.navigate([], { queryParams: { ticket: tag || null }, replaceUrl: true });
  }

  protected chooseUnit(unit: FirmwareUnit): void {
    this.unit.set(unit);
    this.firmwareId.set(null);
  }

  protected patchSettings(patch: Partial<SerialSettings>): void {
    this.settings.update((s) => ({ ...s, ...patch }));
  }

  protected async openPort(): Promise<void> {
    this.portError.set('');
    this.practiceReport.set('');
    if (this.portKind() === 'practice') {
      const v = this.verifiedImage();
      if (!v) {
        this.portError.set('Choose an image first and let it be checked: the practice unit checks what it receives against it.');
        return;
      }
      const link = openPracticeLink(
        practiceSessionOptions(this.faults(), this.settings().baudRate, { bytes: v.bytes, version: v.image.version }),
        (e) => this.onPracticeEvent(e),
      );
      this.attach(link);
      return;
    }
    this.opening.set(true);
    try {
      this.attach(await openWebSerialLink(this.settings()));
    } catch (err) {
      const e = err as Error;
      this.portError.set(e.name === 'NotFoundError' ? 'No port was chosen. Plug the adapter in and choose it in the browser’s list.' : e.message);
    } finally {
      this.opening.set(false);
    }
  }

  private attach(link: SerialLink): void {
    this.sessionLog = '';
    this.logMark = 0;
    this.screen.set('');
    this.noteInLog(`[Port opened: ${link.label}, ${describeSerial(this.settings())}]\n`);
    link.onData = (bytes) => {
      const text = terminalText(bytes);
      if (text) this.show(text);
      this.run()?.receive(bytes);
    };
    link.onLost = (reason) => {
      this.run()?.lost(reason);
      this.link.set(null);
      this.portError.set(`${reason} Plug the adapter back in and open the port again.`);
      this.noteInLog(`\n[Port lost: ${reason}]\n`);
    };
    this.link.set(link);
  }

  protected async closePort(): Promise<void> {
    const link = this.link();
    this.link.set(null);
    await link?.close();
    this.noteInLog('\n[Port closed]\n');
  }

  protected async powerCycle(): Promise<void> {
    await this.closePort();
    await this.openPort();
  }

  private onPracticeEvent(e: PracticeUnitEvent): void {
    if (e.kind === 'power-dip') this.practiceReport.set(`Simulated: the supply dipped as block ${e.block} arrived, and the unit restarted.`);
    if (e.kind === 'flashed') this.practiceReport.set(e.ok ? `Simulated: the unit checked the image (${e.version}) and it passed.` : 'Simulated: the unit’s check of the image failed.');
  }

  protected typed(t: TypedBytes): void {
    const link = this.link();
    if (!link) return;
    this.noteInLog(`[sent: ${t.shown}]`);
    link.write(t.bytes).catch((err: Error) => this.portError.set(`Writing to the port failed: ${err.message}`));
  }

  private show(text: string): void {
    this.sessionLog += text;
    this.screen.update((s) => (s.length + text.length > TERMINAL_MAX_CHARS ? (s + text).slice(-TERMINAL_MAX_CHARS) : s + text));
  }

  private noteInLog(text: string): void {
    this.show(text);
  }

  protected sendImage(): void {
    const link = this.link();
    const v = this.verifiedImage();
    const ticket = this.ticketNow();
    const unit = this.chosenUnit();
    const plan = this.plan();
    if (!link || !v || !ticket || !unit || !plan || this.running()) return;
    this.save.set({ kind: 'idle' });
    this.completed.set(null);
    this.verified.set(null);
    const recorded = new RecordedRun(link, v.bytes, {
      tag: ticket.tag,
      unit,
      firmwareId: v.image.firmwareId,
      imageVersion: v.image.version,
      blocks: plan.blocks,
      settings: this.settings(),
      block: this.block(),
      planSeconds: plan.seconds,
      logBefore: this.sessionLog.slice(this.logMark),
    });
    this.recorded = recorded;
    this.run.set(recorded.run);
    void recorded.finished.then((done) => {
      this.logMark = this.sessionLog.length;
      this.recorded = null;
      this.saveRun(done);
    });
  }

  protected cancel(): void {
    this.run()?.cancel('Cancelled at the bench.');
  }

  /** Saves a run as a flash attempt; on failure it stays in localStorage to be saved later. */
  protected saveRun(p: PendingRun): void {
    const { fields, log, outcome } = attemptOf(p);
    keepPendingRun(p);
    this.save.set({ kind: 'saving', what: `Saving the run as a flash attempt on ${p.tag}…` });
    this.firmware.recordAttempt(p.tag, fields, log).subscribe({
      next: (view) => {
        forgetPendingRun();
        if (this.recovered()?.startedAt === p.startedAt) this.recovered.set(null);
        const number = view.attempts.at(-1)?.number ?? 0;
        this.save.set({ kind: 'saved', number, outcome, tag: p.tag });
        if (view.tag === this.tag()) this.attempts.value.set(view);
        this.completed.set(outcome === 'transfer_completed' && p.tag === this.ticketNow()?.tag ? { pending: p, number } : null);
      },
      error: (err: unknown) => {
        const e = readApiError(err);
        this.save.set({
          kind: 'error',
          message: `The run could not be saved: ${e.message} It is kept in this browser; save it again when the problem is fixed.`,
        });
        this.recovered.set(p);
      },
    });
  }

  protected discardRecovered(): void {
    forgetPendingRun();
    this.recovered.set(null);
  }

  /** After power-cycling: the unit starts with the new image. Recorded as its own attempt, as the workflow asks. */
  protected markVerified(): void {
    const c = this.completed();
    if (!c) return;
    const { fields } = attemptOf(c.pending);
    const after = cleanLog(this.sessionLog.slice(this.logMark));
    const log = after.trim() ? new File([after], `${c.pending.tag}-after-attempt-${c.number}.txt`, { type: 'text/plain' }) : null;
    this.save.set({ kind: 'saving', what: 'Recording the unit as verified running…' });
    this.firmware
      .recordAttempt(
        c.pending.tag,
        {
          ...fields,
          outcome: 'verified_running',
          notes: `Verified running after power-cycling: the unit starts with image ${c.pending.imageVersion} flashed in attempt ${c.number}.`,
        },
        log,
      )
      .subscribe({
        next: (view) => {
          this.logMark = this.sessionLog.length;
          const number = view.attempts.at(-1)?.number ?? 0;
          this.completed.set(null);
          this.verified.set(number);
          this.save.set({ kind: 'saved', number, outcome: 'verified_running', tag: c.pending.tag });
          this.attempts.value.set(view);
        },
        error: (err: unknown) => this.save.set({ kind: 'error', message: `Not recorded: ${readApiError(err).message}` }),
      });
  }

  protected percent(p: { acknowledged: number; blocks: number }): number {
    return p.blocks ? (100 * p.acknowledged) / p.blocks : 0;
  }

  protected rate(bytesPerSecond: number): string {
    return bytesPerSecond >= 1024 ? `${(bytesPerSecond / 1024).toFixed(1)} KiB/s` : `${Math.round(bytesPerSecond)} B/s`;
  }

  protected seconds(s: number | null): string {
    return s === null ? '–' : `${s.toFixed(1)} s`;
  }
}
