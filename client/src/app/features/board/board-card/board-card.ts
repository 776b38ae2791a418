import { ChangeDetectionStrategy, Component, computed, input, output } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatIconModule } from '@angular/material/icon';
import { MatDividerModule } from '@angular/material/divider';
import { MatMenuModule } from '@angular/material/menu';
import { RouterLink } from '@angular/router';
import { STATE_LABELS, TicketState } from '@domain/workflow';
import { AgePipe, hoursSince } from '../../../shared/age';
import { equipmentKindLabel } from '../../../shared/labels';
import { FlagChip } from '../../../shared/state-chip/state-chip';
import type { TechnicianOption } from '../../moves/moves-api';
import { movesFrom, sendBackOf } from '../board-rules';
import { Card } from '../board.models';

/** How long past the club's limit a card has waited: 0 within, 1 past it, 2 past twice it. */
export function waitLevel(stateSince: string, now: number, limitHours: number): 0 | 1 | 2 {
  if (limitHours <= 0) return 0;
  const hours = hoursSince(stateSince, now);
  if (hours > 2 * limitHours) return 2;
  if (hours > limitHours) return 1;
  return 0;
}

/**
 * One ticket on the Bench board: tag, time in the lane, equipment, owner, technician, flags as
 * labelled chips, and a menu with the moves the workflow allows (the keyboard's way to move it),
 * "Send back" to the lane it came from, the parts-on-order flag and who works on it.
 * The lane makes it draggable (cdkDrag on this element).
 */
@Component({
  selector: 'rw-board-card',
  imports: [RouterLink, AgePipe, FlagChip, MatButtonModule, MatDividerModule, MatIconModule, MatMenuModule],
  changeDetection: ChangeDetectionStrategy.OnPush,
  templateUrl: './board-card.html',
  styleUrl: './board-card.scss',
  host: {
    class: 'board-card',
    '[attr.data-tag]': 'card().tag',
    '[class.waited]': 'wait() === 1',
    '[class.waited-long]': 'wait() === 2',
    '[class.pending]': 'pending()',
    '[attr.aria-busy]': 'pending() || null',
  },
})
export class BoardCard {
  readonly card = input.required<Card>();
  /** Clock for the ages (the page ticks it once a minute). */
  readonly now = input.required<number>();
  readonly waitLimitHours = input.required<number>();
  /** A move of this card is on its way to the server. */
  readonly pending = input(false);
  /** Technicians a ticket can be given to (GET /api/technicians), and the signed-in person's id. */
  readonly technicians = input<readonly TechnicianOption[]>([]);
  readonly meId = input<number | null>(null);
  /** The person chose "Move to …" or "Send back to …" in the card's menu. */
  readonly moveTo = output<TicketState>();
  /** The person set (true) or cleared (false) "Parts on order". */
  readonly partsOnOrder = output<boolean>();
  /** The person gave the ticket to a technician (their id) or to nobody (null). */
  readonly assign = output<number | null>();

  protected readonly stateLabels = STATE_LABELS;
  protected readonly kindLabel = equipmentKindLabel;
  protected readonly moves = computed(() => movesFrom(this.card().state));
  protected readonly sendBack = computed(() => sendBackOf(this.card()));
  protected readonly hasParts = computed(() => this.card().flags.includes('parts_on_order'));
  /** Everyone the ticket could go to instead of its technician now (oneself has its own item). */
  protected readonly others = computed(() => this.technicians().filter((t) => t.id !== this.card().technicianId && t.id !== this.meId()));
  protected readonly owner = computed(() => this.card().ownerCallSign || this.card().ownerName);
  protected readonly wait = computed(() => waitLevel(this.card().stateSince, this.now(), this.waitLimitHours()));
}
