import { ChangeDetectionStrategy, Component, computed, inject, input, output, signal } from '@angular/core';
import { rxResource } from '@angular/core/rxjs-interop';
import { MatButtonModule } from '@angular/material/button';
import { MatCardModule } from '@angular/material/card';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatSelectModule } from '@angular/material/select';
import { MatSlideToggleModule } from '@angular/material/slide-toggle';
import type { TicketDetail } from '@contracts/tickets';
import { SessionStore } from '../../../core/auth/session-store';
import { readApiError } from '../../../core/http/api-error';
import { Notifier } from '../../../core/notifier';
import { FlagChip } from '../../../shared/state-chip/state-chip';
import { MovesApi } from '../moves-api';

/** The value of the "nobody" option in the technician select (a select value cannot be null and stay distinct). */
const NOBODY = 0;

/**
 * On the ticket page, for technicians: its flags as chips, the "Parts on order" switch and who
 * works on it (oneself, another technician, or nobody). Each change is a timeline event.
 */
@Component({
  selector: 'rw-ticket-bench',
  imports: [FlagChip, MatButtonModule, MatCardModule, MatFormFieldModule, MatIconModule, MatSelectModule, MatSlideToggleModule],
  changeDetection: ChangeDetectionStrategy.OnPush,
  templateUrl: './ticket-bench.html',
  styleUrl: './ticket-bench.scss',
})
export class TicketBench {
  readonly ticket = input.required<TicketDetail>();
  /** The ticket as the server answered after a change. */
  readonly changed = output<TicketDetail>();

  private readonly api = inject(MovesApi);
  private readonly notifier = inject(Notifier);
  private readonly session = inject(SessionStore);

  protected readonly nobody = NOBODY;
  protected readonly technicians = rxResource({ stream: () => this.api.technicians() });
  protected readonly saving = signal(false);
  protected readonly error = signal('');
  protected readonly closed = computed(() => this.ticket().state === 'closed');
  protected readonly meId = computed(() => this.session.user()?.id ?? null);
  protected readonly flags = computed(() => [
    ...(this.ticket().awaitingApproval ? (['awaiting_approval'] as const) : []),
    ...(this.ticket().partsOnOrder ? (['parts_on_order'] as const) : []),
    // 'test_failed' arrives with test sheets: it will show here from the ticket's own fact.
  ]);

  protected setParts(on: boolean): void {
    this.run(this.api.setPartsOnOrder(this.ticket().tag, on), on ? 'Parts on order.' : 'Parts no longer on order.');
  }

  protected assign(value: number): void {
    const id = value === NOBODY ? null : value;
    if (id === this.ticket().technicianId) return;
    this.run(this.api.assign(this.ticket().tag, id), id === null ? 'Nobody works on it now.' : undefined);
  }

  protected assignToMe(): void {
    const me = this.meId();
    if (me !== null) this.assign(me);
  }

  private run(request: ReturnType<MovesApi['assign']>, said?: string): void {
    if (this.saving()) return;
    this.saving.set(true);
    this.error.set('');
    request.subscribe({
      next: (ticket) => {
        this.saving.set(false);
        this.changed.emit(ticket);
        this.notifier.info(said ?? `${ticket.tag} is now with ${ticket.technicianName}.`);
      },
      error: (err: unknown) => {
        this.saving.set(false);
        const apiError = readApiError(err);
        this.error.set(`${apiError.message} Reload the page if it persists.`);
      },
    });
  }
}
