import { CdkDrag, CdkDragDrop, CdkDropList } from '@angular/cdk/drag-drop';
import { ChangeDetectionStrategy, Component, computed, input, output } from '@angular/core';
import { MatIconModule } from '@angular/material/icon';
import { TicketState } from '@domain/workflow';
import { AgePipe } from '../../../shared/age';
import { BoardCard } from '../board-card/board-card';
import type { TechnicianOption } from '../../moves/moves-api';
import { movesFrom } from '../board-rules';
import { Card } from '../board.models';

/** What a lane shows: its state, words and icon, its cards (oldest first) and the empty-lane text. */
export interface LaneView {
  state: TicketState;
  label: string;
  icon: string;
  cards: Card[];
  count: number;
  oldestSince: string | null;
  emptyText: string;
}

export interface MoveRequest {
  card: Card;
  to: TicketState;
}

/** From a card's menu: set or clear "Parts on order", or give the ticket to a technician (null: nobody). */
export type CardAction = { card: Card; kind: 'parts'; on: boolean } | { card: Card; kind: 'assign'; technicianId: number | null };

/**
 * One lane of the Bench board: header with name, count and oldest age; a drop list of cards.
 * While a card is dragged the lane says whether it takes it (dashed outline and "Drop here" /
 * dimmed and "Not from here"), never by colour alone. The page decides what a drop does.
 */
@Component({
  selector: 'rw-board-lane',
  imports: [CdkDropList, CdkDrag, AgePipe, BoardCard, MatIconModule],
  changeDetection: ChangeDetectionStrategy.OnPush,
  templateUrl: './board-lane.html',
  styleUrl: './board-lane.scss',
  // tabindex -1: the page can put focus on a lane (e.g. after its card was closed and left the board).
  host: { class: 'board-lane', '[attr.aria-labelledby]': "'lane-title-' + lane().state", role: 'region', tabindex: '-1' },
})
export class BoardLane {
  readonly lane = input.required<LaneView>();
  readonly now = input.required<number>();
  readonly waitLimitHours = input.required<number>();
  /** Tags whose move is on its way to the server (not draggable until it answers). */
  readonly pending = input<ReadonlySet<string>>(new Set());
  /** The card being dragged anywhere on the board, if any. */
  readonly dragging = input<Card | null>(null);
  readonly technicians = input<readonly TechnicianOption[]>([]);
  readonly meId = input<number | null>(null);

  readonly moveRequested = output<MoveRequest>();
  readonly actionRequested = output<CardAction>();
  readonly dropped = output<CdkDragDrop<TicketState, TicketState, Card>>();
  readonly dragStarted = output<Card>();
  readonly dragEnded = output<Card>();

  /** Whether the dragged card may come here: 'accepts', 'refuses', or null (not dragging, or its own lane). */
  protected readonly dropHint = computed<'accepts' | 'refuses' | null>(() => {
    const card = this.dragging();
    const state = this.lane().state;
    if (!card || card.state === state) return null;
    return movesFrom(card.state).includes(state) ? 'accepts' : 'refuses';
  });
}
