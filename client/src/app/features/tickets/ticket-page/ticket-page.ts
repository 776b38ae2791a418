import { DatePipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, computed, inject, input, signal } from '@angular/core';
import { rxResource, toSignal } from '@angular/core/rxjs-interop';
import { NonNullableFormBuilder, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatCardModule } from '@angular/material/card';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { RouterLink } from '@angular/router';
import { ALLOWED_MOVES, hasNote, sendBackTarget } from '@domain/workflow';
import { SessionStore } from '../../../core/auth/session-store';
import { readApiError } from '../../../core/http/api-error';
import { Notifier } from '../../../core/notifier';
import { AgePipe } from '../../../shared/age';
import { Caution } from '../../../shared/caution/caution';
import { equipmentKindLabel, stateLabel } from '../../../shared/labels';
import { StateChip } from '../../../shared/state-chip/state-chip';
import { FlashAttempts } from '../../firmware/flash-attempts/flash-attempts';
import { BenchRecords } from '../../bench-records/bench-records/bench-records';
import { DiagnosisSection } from '../../owner-records/diagnosis-section/diagnosis-section';
import { NotesSection } from '../../owner-records/notes-section/notes-section';
import { QuoteSection } from '../../owner-records/quote-section/quote-section';
import { MovesApi, undoWindowMs } from '../../moves/moves-api';
import { TicketBench } from '../../moves/ticket-bench/ticket-bench';
import { TicketLedger } from '../../payments/ticket-ledger/ticket-ledger';
import { IntakeDetails } from '../intake-details/intake-details';
import { TicketApi } from '../ticket-api';
import { TicketDetail, MoveOption } from '../ticket.models';

/** One ticket: what was handed in, by whom, where it is now, and everything that happened to it. */
@Component({
  selector: 'rw-ticket-page',
  imports: [
    ReactiveFormsModule,
    RouterLink,
    DatePipe,
    AgePipe,
    StateChip,
    Caution,
    FlashAttempts,
    BenchRecords,
    DiagnosisSection,
    NotesSection,
    QuoteSection,
    TicketBench,
    TicketLedger,
    IntakeDetails,
    MatCardModule,
    MatButtonModule,
    MatIconModule,
    MatFormFieldModule,
    MatInputModule,
    MatProgressBarModule,
  ],
  changeDetection: ChangeDetectionStrategy.OnPush,
  templateUrl: './ticket-page.html',
  styleUrl: './ticket-page.scss',
})
export class TicketPage {
  /** The tag number from the route (`/tickets/:tag`). */
  readonly tag = input.required<string>();

  private readonly api = inject(TicketApi);
  private readonly notifier = inject(Notifier);
  private readonly movesApi = inject(MovesApi);
  protected readonly session = inject(SessionStore);
  /** Members see only their own tickets, so the list is theirs. */
  protected readonly backLabel = computed(() =>
    this.session.hasAnyRole('technician', 'treasurer', 'admin') ? 'All tickets' : 'My tickets',
  );

  protected readonly ticket = rxResource({
    params: () => this.tag(),
    stream: ({ params }) => this.api.get(params),
  });

  protected readonly stateLabel = stateLabel;
  protected readonly kindLabel = equipmentKindLabel;
  protected readonly now = Date.now();
  protected readonly moving = signal(false);
  protected readonly moveError = signal('');
  protected readonly noteForm = inject(NonNullableFormBuilder).group({ note: ['', [Validators.maxLength(2000)]] });
  private readonly note = toSignal(this.noteForm.controls.note.valueChanges, { initialValue: '' });

  /** Only the lanes the workflow allows from here, and the way back; the others are not choices at all. */
  protected readonly moves = computed<MoveOption[]>(() => {
    if (!this.ticket.hasValue()) return [];
    const t = this.ticket.value();
    const lanes = ALLOWED_MOVES[t.state] ?? [];
    const back = this.sendBack();
    return t.moves.filter((m) => lanes.includes(m.to) || m.to === back);
  });
  /** The lane it came from, when going there is a send-back (a note says why). */
  protected readonly sendBack = computed(() =>
    this.ticket.hasValue() ? sendBackTarget({ state: this.ticket.value().state, previousState: this.ticket.value().previousState }) : null,
  );

  /**
   * Whether a move button is live. The server asks the workflow (`moveRequirement`) and marks a
   * move that only wants a note `noteRequired`; it becomes possible once the note is long enough
   * for the same workflow (`hasNote`). The server checks again when the move is sent.
   */
  protected canMove(option: MoveOption): boolean {
    if (option.noteRequired) return hasNote(this.note());
    return option.allowed;
  }

  protected move(ticket: TicketDetail, option: MoveOption): void {
    if (!this.canMove(option) || this.moving()) return;
    this.moveError.set('');
    this.moving.set(true);
    const note = this.noteForm.controls.note.value.trim();
    this.api.move(ticket.tag, { to: option.to, version: ticket.version, ...(note ? { note } : {}) }).subscribe({
      next: (updated) => {
        this.ticket.value.set(updated);
        this.noteForm.reset();
        this.moving.set(false);
        void this.offerUndo(updated);
      },
      error: (err: unknown) => {
        const apiError = readApiError(err);
        this.moveError.set(
          apiError.status === 409 ? `${apiError.message} The ticket has been reloaded: check it and try again.` : apiError.message,
        );
        this.moving.set(false);
        if (apiError.status === 409) this.ticket.reload();
      },
    });
  }

  /** The snack bar offers Undo until the server's deadline; Undo puts the ticket back. */
  private async offerUndo(updated: TicketDetail): Promise<void> {
    const message = `${updated.tag} moved to ${stateLabel(updated.state)}.`;
    if (!updated.undo) {
      this.notifier.info(message);
      return;
    }
    const undo = updated.undo;
    if (!(await this.notifier.offer(message, 'Undo', undoWindowMs(undo.until)))) return;
    this.movesApi.undo(updated.tag, undo.eventId, updated.version).subscribe({
      next: (back) => {
        this.ticket.value.set(back);
        this.notifier.info(`Move undone: ${back.tag} is back in ${stateLabel(back.state)}.`);
      },
      error: (err: unknown) => {
        this.moveError.set(readApiError(err).message);
        this.ticket.reload();
      },
    });
  }
}
