import { CdkDrag, CdkDragDrop, CdkDropList, CdkDropListGroup } from '@angular/cdk/drag-drop';
import { ChangeDetectionStrategy, Component, DestroyRef, computed, inject, linkedSignal, signal } from '@angular/core';
import { rxResource, takeUntilDestroyed } from '@angular/core/rxjs-interop';
import { NonNullableFormBuilder, ReactiveFormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatCardModule } from '@angular/material/card';
import { MatDialog } from '@angular/material/dialog';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatMenuModule } from '@angular/material/menu';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { MatSelectModule } from '@angular/material/select';
import { RouterLink } from '@angular/router';
import { BOARD_LANES, STATE_LABELS, TicketState } from '@domain/workflow';
import { debounceTime, distinctUntilChanged, firstValueFrom, map } from 'rxjs';
import { readApiError } from '../../../core/http/api-error';
import { Notifier } from '../../../core/notifier';
import { AgePipe, hoursSince } from '../../../shared/age';
import { STATE_ICONS, equipmentKindLabel } from '../../../shared/labels';
import { NoteDialog, NoteDialogData } from '../../../shared/note-dialog/note-dialog';
import { FlagChip } from '../../../shared/state-chip/state-chip';
import { TicketApi } from '../../tickets/ticket-api';
import { BoardApi } from '../board-api';
import { checkCardMove, moveNeedsNote, movesFrom, notePrompt } from '../board-rules';
import { Card } from '../board.models';

/** Technician filter value for cards no technician has taken yet. */
export const NOT_TAKEN = '__not_taken__';

const EMPTY_LANE_TEXT: Record<TicketState, string> = {
  intake: 'No tickets waiting at intake. Members can hand equipment in from Hand in equipment.',
  diagnosis: 'Nothing in diagnosis. Take a ticket from Intake to start.',
  reflash: 'No reflash waiting. Tickets come here from Diagnosis when the owner has consented.',
  repair: 'Nothing on the repair bench. Tickets come here from Diagnosis, Reflash or a failed bench test.',
  bench_test: 'Nothing waiting for a test sheet. Repaired and reflashed equipment lands here.',
  return: 'Nothing ready to go back to its owner.',
  closed: 'Closed tickets leave the board.',
};

export interface LaneView {
  state: TicketState;
  label: string;
  icon: string;
  cards: Card[];
  count: number;
  oldestSince: string | null;
  emptyText: string;
}

/** The Bench board: one lane per workflow state, cards dragged (or moved from a menu) between them. */
@Component({
  selector: 'rw-board-page',
  imports: [
    ReactiveFormsModule,
    RouterLink,
    CdkDropListGroup,
    CdkDropList,
    CdkDrag,
    AgePipe,
    FlagChip,
    MatCardModule,
    MatButtonModule,
    MatIconModule,
    MatMenuModule,
    MatFormFieldModule,
    MatInputModule,
    MatSelectModule,
    MatProgressBarModule,
  ],
  changeDetection: ChangeDetectionStrategy.OnPush,
  templateUrl: './board-page.html',
  styleUrl: './board-page.scss',
})
export class BoardPage {
  private readonly boardApi = inject(BoardApi);
  private readonly ticketApi = inject(TicketApi);
  private readonly notifier = inject(Notifier);
  private readonly dialog = inject(MatDialog);

  protected readonly notTaken = NOT_TAKEN;
  protected readonly kindLabel = equipmentKindLabel;
  protected readonly stateLabels = STATE_LABELS;
  protected readonly movesFrom = movesFrom;

  protected readonly filters = inject(NonNullableFormBuilder).group({ technician: [''], q: [''] });
  private readonly q = signal('');
  protected readonly technician = signal('');

  protected readonly board = rxResource({
    params: () => ({ q: this.q() }),
    stream: ({ params }) => this.boardApi.board(params),
  });

  /** The cards as shown: the server's, with moves applied optimistically until it answers. */
  protected readonly cards = linkedSignal<Card[]>(() => (this.board.hasValue() ? this.board.value().cards : []));
  protected readonly waitLimitHours = computed(() => (this.board.hasValue() ? this.board.value().waitLimitHours : 72));
  /** Tags with a move on its way to the server: not draggable until it answers. */
  protected readonly pending = signal<ReadonlySet<string>>(new Set());
  protected readonly dragging = signal<Card | null>(null);
  protected readonly announcement = signal('');
  protected readonly now = signal(Date.now());

  protected readonly technicians = computed(() => {
    const names = new Set<string>();
    for (const c of this.cards()) if (c.technicianName) names.add(c.technicianName);
    const chosen = this.technician();
    if (chosen && chosen !== NOT_TAKEN) names.add(chosen);
    return [...names].sort((a, b) => a.localeCompare(b));
  });

  private readonly visibleCards = computed(() => {
    const who = this.technician();
    if (!who) return this.cards();
    return this.cards().filter((c) => (who === NOT_TAKEN ? !c.technicianName : c.technicianName === who));
  });

  protected readonly lanes = computed<LaneView[]>(() => {
    const cards = this.visibleCards();
    return BOARD_LANES.map((state) => {
      const laneCards = cards
        .filter((c) => c.state === state)
        .sort((a, b) => Date.parse(a.stateSince) - Date.parse(b.stateSince));
      return {
        state,
        label: STATE_LABELS[state],
        icon: STATE_ICONS[state],
        cards: laneCards,
        count: laneCards.length,
        oldestSince: laneCards[0]?.stateSince ?? null,
        emptyText: EMPTY_LANE_TEXT[state],
      };
    });
  });

  constructor() {
    this.filters.controls.q.valueChanges
      .pipe(debounceTime(300), map((q) => q.trim()), distinctUntilChanged(), takeUntilDestroyed())
      .subscribe((q) => this.q.set(q));
    this.filters.controls.technician.valueChanges.pipe(takeUntilDestroyed()).subscribe((t) => this.technician.set(t));
    // Ages on the cards move on by themselves; once a minute is enough for "min / h / d".
    const tick = setInterval(() => this.now.set(Date.now()), 60_000);
    inject(DestroyRef).onDestroy(() => clearInterval(tick));
  }

  /** How long past the club's limit a card has waited: 0 within, 1 past it, 2 past twice it. */
  protected waitLevel(card: Card): 0 | 1 | 2 {
    const hours = hoursSince(card.stateSince, this.now());
    const limit = this.waitLimitHours();
    if (limit <= 0) return 0;
    if (hours > 2 * limit) return 2;
    if (hours > limit) return 1;
    return 0;
  }

  protected ownerOf(card: Card): string {
    return card.ownerCallSign || card.ownerName;
  }

  protected laneAccepts(state: TicketState): boolean {
    const card = this.dragging();
    return !!card && card.state !== state && movesFrom(card.state).includes(state);
  }

  dropped(event: CdkDragDrop<TicketState, TicketState, Card>): void {
    const card = event.item.data;
    const to = event.container.data;
    if (!card || event.previousContainer === event.container || card.state === to) return;
    void this.requestMove(card, to);
  }

  /** The one way a card moves, whether dragged or chosen from its menu. */
  async requestMove(card: Card, to: TicketState): Promise<void> {
    if (this.pending().has(card.tag)) return;
    const needsNote = moveNeedsNote(card, to);
    // First the lane rule alone (a stand-in note keeps the "needs a note" guard out of the way).
    const laneCheck = checkCardMove(card, to, needsNote ? 'lane rule only' : undefined);
    if (!laneCheck.allowed) {
      this.refuse(card, laneCheck.reason);
      return;
    }
    let note: string | undefined;
    if (needsNote) {
      note = await this.askForNote(card, to);
      if (note === undefined) return;
      const withNote = checkCardMove(card, to, note);
      if (!withNote.allowed) {
        this.refuse(card, withNote.reason);
        return;
      }
    }
    this.send(card, to, note);
  }

  private refuse(card: Card, reason: string): void {
    this.notifier.error(reason);
    this.announcement.set(`${card.tag} stays in ${STATE_LABELS[card.state]}. ${reason}`);
  }

  private async askForNote(card: Card, to: TicketState): Promise<string | undefined> {
    const ref = this.dialog.open<NoteDialog, NoteDialogData, string>(NoteDialog, {
      data: {
        title: `Move ${card.tag} to ${STATE_LABELS[to]}`,
        prompt: notePrompt(card, to),
        confirmLabel: `Move to ${STATE_LABELS[to]}`,
        minLength: 3,
      },
    });
    return firstValueFrom(ref.afterClosed());
  }

  private send(card: Card, to: TicketState, note?: string): void {
    const original = card;
    this.replaceCard({ ...card, state: to, stateSince: new Date().toISOString() });
    this.setPending(card.tag, true);
    this.ticketApi.move(card.tag, { to, version: card.version, ...(note ? { note } : {}) }).subscribe({
      next: (ticket) => {
        this.setPending(card.tag, false);
        this.replaceCard({
          ...original,
          state: ticket.state,
          stateSince: ticket.stateSince,
          version: ticket.version,
          technicianName: ticket.technicianName ?? original.technicianName,
        });
        this.announcement.set(`${card.tag} moved to ${STATE_LABELS[ticket.state]}.`);
      },
      error: (err: unknown) => {
        this.setPending(card.tag, false);
        const apiError = readApiError(err);
        this.replaceCard(original);
        this.notifier.error(apiError.message);
        this.announcement.set(`${card.tag} went back to ${STATE_LABELS[original.state]}. ${apiError.message}`);
        // Someone else changed the ticket: fetch the board so the next try uses its new version.
        if (apiError.status === 409) this.board.reload();
      },
    });
  }

  private replaceCard(next: Card): void {
    this.cards.update((cards) => cards.map((c) => (c.tag === next.tag ? next : c)));
  }

  private setPending(tag: string, on: boolean): void {
    this.pending.update((set) => {
      const copy = new Set(set);
      if (on) copy.add(tag);
      else copy.delete(tag);
      return copy;
    });
  }

  protected clearFilters(): void {
    this.filters.setValue({ technician: '', q: '' });
  }
}
