import { BreakpointObserver } from '@angular/cdk/layout';
import { CdkDragDrop, CdkDropListGroup } from '@angular/cdk/drag-drop';
import { DatePipe } from '@angular/common';
import {
  ChangeDetectionStrategy,
  Component,
  DestroyRef,
  ElementRef,
  Injector,
  afterNextRender,
  computed,
  effect,
  inject,
  linkedSignal,
  signal,
  untracked,
} from '@angular/core';
import { rxResource, takeUntilDestroyed, toSignal } from '@angular/core/rxjs-interop';
import { NonNullableFormBuilder, ReactiveFormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatChipsModule } from '@angular/material/chips';
import { MatDialog } from '@angular/material/dialog';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { MatSelectModule } from '@angular/material/select';
import { NOTE_MIN_LENGTH, STATE_LABELS, TicketState } from '@domain/workflow';
import { debounceTime, distinctUntilChanged, firstValueFrom, map, retry, timer } from 'rxjs';
import { SessionStore } from '../../../core/auth/session-store';
import { readApiError } from '../../../core/http/api-error';
import { Notifier } from '../../../core/notifier';
import { STATE_ICONS } from '../../../shared/labels';
import { NoteDialog, NoteDialogData } from '../../../shared/note-dialog/note-dialog';
import { MovesApi, undoWindowMs } from '../../moves/moves-api';
import { TicketApi } from '../../tickets/ticket-api';
import type { TicketDetail } from '../../tickets/ticket.models';
import { BoardApi } from '../board-api';
import { BoardLane, CardAction, LaneView, MoveRequest } from '../board-lane/board-lane';
import { cardMoveRequirement, sendBackOf } from '../board-rules';
import type { Flag } from '@contracts/board';
import { Card, LiveSignal, LoadedBoard } from '../board.models';

/** Technician filter value for cards no technician has taken yet (the server's `technician=none`). */
export const NOT_TAKEN = 'none';

/** Below this width the board shows one lane at a time, with a lane switcher. */
export const PHONE_QUERY = '(max-width: 599.98px)';

const EMPTY_LANE_TEXT: Record<TicketState, string> = {
  intake: 'No tickets waiting at intake. Members can hand equipment in from Hand in equipment.',
  diagnosis: 'Nothing in diagnosis. Take a ticket from Intake to start.',
  reflash: 'No reflash waiting. Tickets come here from Diagnosis when the owner has consented.',
  repair: 'Nothing on the repair bench. Tickets come here from Diagnosis, Reflash or a failed bench test.',
  bench_test: 'Nothing waiting for a test sheet. Repaired and reflashed equipment lands here.',
  return: 'Nothing ready to go back to its owner.',
  closed: 'Closed tickets leave the board.',
};

export type Connection = 'connecting' | 'live' | 'lost';

/**
 * The Bench board: one lane per workflow state (the server's lanes), cards dragged (or moved from
 * their menu) between them, kept live by the board's event stream.
 *
 * The technician filter works on the page, by id: the board is loaded whole anyway (every open
 * ticket), so filtering here is instant and needs no request, the list of technicians comes from
 * the same cards, and every open board asks the server for the same unfiltered board, which the
 * server builds once per revision and serves from its cache to everyone refreshing after a move.
 * The text search goes to the server (`q`), which matches fields the cards do not carry.
 */
@Component({
  selector: 'rw-board-page',
  imports: [
    ReactiveFormsModule,
    DatePipe,
    CdkDropListGroup,
    BoardLane,
    MatButtonModule,
    MatChipsModule,
    MatIconModule,
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
  private readonly movesApi = inject(MovesApi);
  private readonly session = inject(SessionStore);
  private readonly notifier = inject(Notifier);
  private readonly dialog = inject(MatDialog);
  private readonly injector = inject(Injector);
  private readonly host = inject<ElementRef<HTMLElement>>(ElementRef);

  protected readonly notTaken = NOT_TAKEN;
  protected readonly compact = toSignal(inject(BreakpointObserver).observe(PHONE_QUERY).pipe(map((s) => s.matches)), {
    initialValue: false,
  });

  protected readonly filters = inject(NonNullableFormBuilder).group({ technician: [''], q: [''] });
  private readonly q = signal('');
  /** '' for everyone, NOT_TAKEN, or a technician's user id. */
  protected readonly technician = signal('');

  protected readonly board = rxResource({
    params: () => ({ q: this.q() }),
    stream: ({ params }) => this.boardApi.board(params),
  });
  /** The last board that loaded, kept through a failed refresh so the board never blanks. */
  protected readonly loaded = linkedSignal<LoadedBoard | undefined, LoadedBoard | undefined>({
    source: () => (this.board.hasValue() ? this.board.value() : undefined),
    computation: (next, previous) => next ?? previous?.value,
  });

  /**
   * Moves made on this page, as this page last knew the card: while its move is on the way (the
   * card shows in its new lane at once) and after, until a board from the server has caught up
   * (a version at least as high), so a refresh that was already under way does not put it back.
   */
  private readonly local = signal<ReadonlyMap<string, Card>>(new Map());
  protected readonly cards = computed<Card[]>(() => {
    const server = this.loaded()?.cards ?? [];
    const local = this.local();
    if (local.size === 0) return server;
    return server.map((c) => {
      const mine = local.get(c.tag);
      return mine && mine.version > c.version ? mine : c;
    });
  });
  /** Who a ticket can be given to from a card's menu (every active technician, not only those on the board). */
  protected readonly benchTechnicians = rxResource({ stream: () => this.movesApi.technicians() });
  protected readonly meId = computed(() => this.session.user()?.id ?? null);
  protected readonly waitLimitHours = computed(() => this.loaded()?.waitLimitHours ?? 72);
  /** Tags with a move on its way to the server: not draggable until it answers. */
  protected readonly pending = signal<ReadonlySet<string>>(new Set());
  protected readonly dragging = signal<Card | null>(null);
  protected readonly announcement = signal('');
  protected readonly now = signal(Date.now());

  /** Every technician seen on this page's boards (id → name), so a chosen one stays in the list when their cards leave. */
  private readonly knownTechnicians = linkedSignal<Card[] | undefined, ReadonlyMap<number, string>>({
    source: () => this.loaded()?.cards,
    computation: (cards, previous) => {
      const known = new Map(previous?.value ?? []);
      for (const c of cards ?? []) if (c.technicianId !== null && c.technicianName) known.set(c.technicianId, c.technicianName);
      return known;
    },
  });
  protected readonly technicians = computed(() =>
    [...this.knownTechnicians()]
      .map(([id, name]) => ({ id: String(id), name }))
      .sort((a, b) => a.name.localeCompare(b.name)),
  );

  private readonly visibleCards = computed(() => {
    const who = this.technician();
    if (!who) return this.cards();
    if (who === NOT_TAKEN) return this.cards().filter((c) => c.technicianId === null);
    const id = Number(who);
    return this.cards().filter((c) => c.technicianId === id);
  });

  /** The server's lanes (which and in what order), filled with the cards shown. */
  protected readonly lanes = computed<LaneView[]>(() => {
    const cards = this.visibleCards();
    return (this.loaded()?.lanes ?? []).map(({ state }) => {
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

  /** On a phone: the one lane shown. */
  protected readonly selectedLane = signal<TicketState>('intake');
  protected readonly shownLanes = computed(() =>
    this.compact() ? this.lanes().filter((l) => l.state === this.selectedLane()) : this.lanes(),
  );

  protected readonly connection = signal<Connection>('connecting');
  /** When a board last came from the server. */
  protected readonly lastUpdated = signal<number | null>(null);
  /** The newest revision the live stream reported. */
  private latestRevision: string | null | undefined;
  /** A refresh waits for the drag in progress to end. */
  private refreshWanted = false;
  /** Said on screen while a refresh waits for the drop. */
  protected readonly changesWaiting = signal(false);
  /** Notes typed for a move that did not go through (e.g. 409), shown again on the next try. */
  private readonly drafts = new Map<string, string>();
  private jumpedFor = '';

  constructor() {
    this.filters.controls.q.valueChanges
      .pipe(debounceTime(300), map((q) => q.trim()), distinctUntilChanged(), takeUntilDestroyed())
      .subscribe((q) => this.q.set(q));
    this.filters.controls.technician.valueChanges.pipe(takeUntilDestroyed()).subscribe((t) => this.technician.set(t));
    // Ages on the cards move on by themselves; once a minute is enough for "min / h / d".
    const tick = setInterval(() => this.now.set(Date.now()), 60_000);
    inject(DestroyRef).onDestroy(() => clearInterval(tick));

    // Each board that arrives: note the time, drop local moves it has caught up with, and
    // fetch again if the stream has already reported a newer revision.
    effect(() => {
      const board = this.board.hasValue() ? this.board.value() : undefined;
      if (!board) return;
      untracked(() => {
        this.lastUpdated.set(Date.now());
        this.pruneLocal(board);
        if (this.latestRevision !== undefined && board.revision !== this.latestRevision) this.refresh();
        this.jumpToMatch(board);
      });
    });

    this.boardApi
      .revisions()
      .pipe(
        // The server refused or dropped the stream for good (signed out, server away): try again
        // with growing pauses; the board read in between sends a signed-out person to sign in.
        retry({
          resetOnSuccess: true,
          delay: (_err, count) => {
            this.connection.set('lost');
            this.refresh();
            return timer(Math.min(30_000, 2_000 * 2 ** Math.min(count - 1, 4)));
          },
        }),
        takeUntilDestroyed(),
      )
      .subscribe((live) => this.onLive(live));
  }

  private onLive(live: LiveSignal): void {
    if (live.kind === 'lost') {
      this.connection.set('lost');
      return;
    }
    this.connection.set('live');
    if (live.kind !== 'revision') return;
    this.latestRevision = live.revision;
    const board = this.loaded();
    if (board && board.revision !== live.revision) this.refresh();
  }

  /** Fetches the board again, unless a card is being dragged (then when the drop ends) or a fetch is under way (then after it). */
  private refresh(): void {
    if (this.dragging()) {
      this.refreshWanted = true;
      this.changesWaiting.set(true);
      return;
    }
    this.refreshWanted = false;
    this.changesWaiting.set(false);
    // A fetch under way: the effect above fetches again if it comes back older than the stream.
    if (this.board.isLoading()) return;
    this.board.reload();
  }

  private pruneLocal(board: LoadedBoard): void {
    const local = this.local();
    if (local.size === 0) return;
    const versions = new Map(board.cards.map((c) => [c.tag, c.version]));
    const next = new Map([...local].filter(([tag, card]) => this.pending().has(tag) || card.version > (versions.get(tag) ?? Infinity)));
    if (next.size !== local.size) this.local.set(next);
  }

  /** A new search: on a phone, show the lane that holds the first match (unless the lane shown has one). */
  private jumpToMatch(board: LoadedBoard): void {
    if (board.q === this.jumpedFor) return;
    this.jumpedFor = board.q;
    if (!board.q) return;
    const lanes = this.lanes();
    const first = lanes.find((l) => l.count > 0);
    if (!first) {
      this.announcement.set(`Nothing on the board matches “${board.q}”.`);
      return;
    }
    if (lanes.find((l) => l.state === this.selectedLane())?.count) return;
    this.selectedLane.set(first.state);
    this.announcement.set(`Matches in ${first.label}: showing that lane.`);
    afterNextRender({ write: () => this.laneElement(first.state)?.scrollIntoView?.({ block: 'nearest', inline: 'nearest' }) }, { injector: this.injector });
  }

  protected pickLane(state: TicketState | undefined): void {
    if (state) this.selectedLane.set(state);
  }

  protected dragStarted(card: Card): void {
    this.dragging.set(card);
  }

  protected dragEnded(): void {
    this.dragging.set(null);
    if (this.refreshWanted) this.refresh();
  }

  dropped(event: CdkDragDrop<TicketState, TicketState, Card>): void {
    const card = event.item.data;
    const to = event.container.data;
    if (!card || event.previousContainer === event.container || card.state === to) return;
    void this.requestMove(card, to);
  }

  protected moveFromMenu(request: MoveRequest): void {
    void this.requestMove(request.card, request.to);
  }

  /** The one way a card moves, whether dragged or chosen from its menu. */
  async requestMove(card: Card, to: TicketState): Promise<void> {
    if (this.pending().has(card.tag)) return;
    const need = cardMoveRequirement(card, to);
    if (!need.allowed) {
      this.refuse(card, need.reason);
      this.focusCard(card.tag);
      return;
    }
    let note: string | undefined;
    if (need.noteRequired) {
      note = await this.askForNote(card, to, need.reason);
      if (note === undefined) {
        this.announcement.set(`${card.tag} stays in ${STATE_LABELS[card.state]}.`);
        this.focusCard(card.tag);
        return;
      }
      // The board may have been refreshed while the note was written.
      const latest = this.cards().find((c) => c.tag === card.tag);
      if (!latest || latest.state !== card.state) {
        this.drafts.set(card.tag, note);
        const where = latest ? `is now in ${STATE_LABELS[latest.state]}` : 'has left the board';
        this.refuse(card, `Someone else moved ${card.tag} while you wrote the note: it ${where}. Your note is kept for the next try.`);
        this.focusCard(card.tag);
        return;
      }
      card = latest;
    }
    this.send(card, to, note);
  }

  private refuse(card: Card, reason: string): void {
    this.notifier.error(reason);
    this.announcement.set(`${card.tag} stays in ${STATE_LABELS[card.state]}. ${reason}`);
  }

  private async askForNote(card: Card, to: TicketState, prompt: string): Promise<string | undefined> {
    const draft = this.drafts.get(card.tag);
    const back = sendBackOf(card) === to;
    const ref = this.dialog.open<NoteDialog, NoteDialogData, string>(NoteDialog, {
      // Focus goes back to the card itself (it may have moved lanes meanwhile), not to the menu.
      restoreFocus: false,
      data: {
        title: back ? `Send ${card.tag} back to ${STATE_LABELS[to]}` : `Move ${card.tag} to ${STATE_LABELS[to]}`,
        prompt,
        confirmLabel: back ? `Send back to ${STATE_LABELS[to]}` : `Move to ${STATE_LABELS[to]}`,
        minLength: NOTE_MIN_LENGTH,
        ...(draft ? { initialNote: draft, notice: 'Your note from the last try is kept: check it and move again.' } : {}),
      },
    });
    return firstValueFrom(ref.afterClosed(), { defaultValue: undefined });
  }

  private send(card: Card, to: TicketState, note?: string): void {
    const tag = card.tag;
    this.setLocal({ ...card, state: to, stateSince: new Date().toISOString(), version: card.version + 1 });
    this.setPending(tag, true);
    this.followCard(tag, to, card.state);
    this.ticketApi.move(tag, { to, version: card.version, ...(note ? { note } : {}) }).subscribe({
      next: (ticket) => {
        this.setPending(tag, false);
        this.drafts.delete(tag);
        this.setLocal({
          ...card,
          state: ticket.state,
          stateSince: ticket.stateSince,
          version: ticket.version,
          technicianName: ticket.technicianName ?? card.technicianName,
        });
        this.announcement.set(`${tag} moved to ${STATE_LABELS[ticket.state]}.`);
        void this.offerUndo(card, ticket);
      },
      error: (err: unknown) => {
        this.setPending(tag, false);
        this.dropLocal(tag);
        if (note) this.drafts.set(tag, note);
        const apiError = readApiError(err);
        // The session ended: the error interceptor has sent the person to sign in.
        if (apiError.status === 401) return;
        const kept = note ? ' Your note is kept for the next try.' : '';
        this.notifier.error(apiError.message + kept);
        this.announcement.set(`${tag} went back to ${STATE_LABELS[card.state]}. ${apiError.message}${kept}`);
        this.followCard(tag, card.state);
        // Someone else changed the ticket: fetch the board so the next try uses its new version.
        if (apiError.status === 409) this.refresh();
      },
    });
  }

  /**
   * After a move: the snack bar offers Undo until the server's deadline (`ticket.undo.until`, the
   * grace period RW_UNDO_GRACE_SECONDS). Undo puts the card back where the server put the ticket.
   */
  private async offerUndo(card: Card, ticket: TicketDetail): Promise<void> {
    const undo = ticket.undo;
    if (!undo) return;
    const undone = await this.notifier.offer(`${ticket.tag} moved to ${STATE_LABELS[ticket.state]}.`, 'Undo', undoWindowMs(undo.until));
    if (!undone) return;
    this.setPending(ticket.tag, true);
    this.movesApi.undo(ticket.tag, undo.eventId, ticket.version).subscribe({
      next: (back) => {
        this.setPending(ticket.tag, false);
        this.setLocal(cardFrom(card, back));
        this.notifier.info(`Move undone: ${back.tag} is back in ${STATE_LABELS[back.state]}.`);
        this.announcement.set(`Move undone: ${back.tag} is back in ${STATE_LABELS[back.state]}.`);
        this.followCard(back.tag, back.state);
      },
      error: (err: unknown) => this.actionFailed(ticket.tag, err),
    });
  }

  /** "Parts on order" and assignment from a card's menu. */
  protected cardAction(action: CardAction): void {
    const { card } = action;
    if (this.pending().has(card.tag)) return;
    this.setPending(card.tag, true);
    const request =
      action.kind === 'parts' ? this.movesApi.setPartsOnOrder(card.tag, action.on) : this.movesApi.assign(card.tag, action.technicianId);
    request.subscribe({
      next: (ticket) => {
        this.setPending(card.tag, false);
        this.setLocal(cardFrom(card, ticket));
        const said =
          action.kind === 'parts'
            ? `${card.tag}: ${action.on ? 'parts on order' : 'parts no longer on order'}.`
            : ticket.technicianName
              ? `${card.tag} is now with ${ticket.technicianName}.`
              : `${card.tag} is not taken by anyone now.`;
        this.notifier.info(said);
        this.announcement.set(said);
        this.focusCard(card.tag);
      },
      error: (err: unknown) => this.actionFailed(card.tag, err),
    });
  }

  private actionFailed(tag: string, err: unknown): void {
    this.setPending(tag, false);
    const apiError = readApiError(err);
    if (apiError.status === 401) return;
    this.notifier.error(apiError.message);
    this.announcement.set(`${tag}: ${apiError.message}`);
    this.refresh();
  }

  /** Keeps the card in sight and focus on it: on a phone, show its lane; then focus its menu button. */
  private followCard(tag: string, state: TicketState, from?: TicketState): void {
    if (this.compact() && this.lanes().some((l) => l.state === state)) this.selectedLane.set(state);
    this.focusCard(tag, from);
  }

  /**
   * Puts keyboard focus on the card's menu button once the board has rendered; when the card has
   * left the board (closed) or the filter hides it, on the lane it left instead.
   */
  private focusCard(tag: string, fallbackLane?: TicketState): void {
    afterNextRender(
      {
        write: () => {
          const root = this.host.nativeElement;
          const button = root.querySelector<HTMLElement>(`[data-tag="${tag}"] .card-menu`);
          if (button) button.focus();
          else if (fallbackLane) root.querySelector<HTMLElement>(`rw-board-lane[aria-labelledby="lane-title-${fallbackLane}"]`)?.focus();
        },
      },
      { injector: this.injector },
    );
  }

  private laneElement(state: TicketState): HTMLElement | null {
    return this.host.nativeElement.querySelector<HTMLElement>(`[data-lane="${state}"]`);
  }

  private setLocal(card: Card): void {
    this.local.update((map) => new Map(map).set(card.tag, card));
  }

  private dropLocal(tag: string): void {
    this.local.update((map) => {
      const copy = new Map(map);
      copy.delete(tag);
      return copy;
    });
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

/** The card as the server answered for its ticket (after an undo, a flag or an assignment). */
export function cardFrom(card: Card, ticket: TicketDetail): Card {
  // The server's order: awaiting approval, parts on order, then the flags of other features.
  const flags: Flag[] = [
    ...(ticket.awaitingApproval ? (['awaiting_approval'] as const) : []),
    ...(ticket.partsOnOrder ? (['parts_on_order'] as const) : []),
    ...card.flags.filter((f) => f !== 'parts_on_order' && f !== 'awaiting_approval'),
  ];
  return {
    ...card,
    state: ticket.state,
    stateSince: ticket.stateSince,
    version: ticket.version,
    technicianId: ticket.technicianId,
    technicianName: ticket.technicianName,
    previousState: ticket.previousState,
    flags,
  };
}
