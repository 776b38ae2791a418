import { BreakpointObserver } from '@angular/cdk/layout';
import { CdkDragDrop } from '@angular/cdk/drag-drop';
import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, TestRequest, provideHttpClientTesting } from '@angular/common/http/testing';
import { ComponentFixture, TestBed } from '@angular/core/testing';
import { MatChipListboxHarness } from '@angular/material/chips/testing';
import { MatDialog } from '@angular/material/dialog';
import { MatMenuHarness } from '@angular/material/menu/testing';
import { MatSelectHarness } from '@angular/material/select/testing';
import { provideRouter } from '@angular/router';
import { BOARD_LANES, TicketState } from '@domain/workflow';
import { BehaviorSubject, map, of } from 'rxjs';
import { SessionStore } from '../../../core/auth/session-store';
import { Notifier } from '../../../core/notifier';
import type { TicketDetail } from '../../tickets/ticket.models';
import { EVENT_SOURCE_FACTORY } from '../board-api';
import { Board, Card } from '../board.models';
import { BoardPage } from './board-page';

const HOUR = 3_600_000;
const iso = (hoursAgo: number) => new Date(Date.now() - hoursAgo * HOUR).toISOString();

function card(tag: string, state: TicketState, extra: Partial<Card> = {}): Card {
  return {
    id: Number(tag.slice(3)),
    tag,
    equipmentKind: 'transceiver',
    makeModel: 'Kestrel QX-7',
    ownerName: 'Orla Fenwick',
    ownerCallSign: 'Q2KFA',
    state,
    stateSince: iso(2),
    version: 3,
    technicianId: null,
    technicianName: null,
    previousState: null,
    flags: [],
    ...extra,
  };
}

function boardBody(cards?: Card[]): Board {
  return {
    waitLimitHours: 48,
    lanes: BOARD_LANES.map((state) => ({ state, count: 0, oldestSince: null })),
    cards: cards ?? [
      card('RW-0001', 'intake', { stateSince: iso(5) }),
      card('RW-0002', 'intake', { stateSince: iso(60), ownerCallSign: null, ownerName: 'Bram Ellery' }),
      card('RW-0003', 'diagnosis', { stateSince: iso(100), technicianId: 11, technicianName: 'Ines Marrow', flags: ['awaiting_approval'] }),
      card('RW-0004', 'diagnosis', { technicianId: 11, technicianName: 'Ines Marrow' }),
      card('RW-0005', 'bench_test', { flags: ['test_failed'], technicianId: 12, technicianName: 'Tobin Reed' }),
    ],
  };
}

const TECHNICIANS = [
  { id: 11, displayName: 'Ines Marrow', callSign: 'Q7IM' },
  { id: 12, displayName: 'Tobin Reed', callSign: null },
];

/** What the server answers for a ticket (only the fields the board reads matter here). */
function detailOf(c: Card, extra: Partial<TicketDetail> = {}): TicketDetail {
  return {
    ...c,
    createdAt: iso(10),
    serialNumber: null,
    units: [],
    faultReported: 'No transmit.',
    symptoms: ['no_transmit'],
    accessoriesNote: null,
    updatesBy: 'email',
    accessories: [],
    firmwareVersions: null,
    reflashConsent: true,
    notifyByEmail: true,
    ownerEmail: 'orla@fenmail.example',
    ownerPhone: null,
    awaitingApproval: c.flags.includes('awaiting_approval'),
    partsOnOrder: c.flags.includes('parts_on_order'),
    events: [],
    moves: [],
    undo: null,
    ...extra,
  };
}

/** A stand-in for the browser's EventSource (jsdom has none). */
class FakeEventSource {
  readyState = 0;
  onopen: (() => void) | null = null;
  onerror: (() => void) | null = null;
  closed = false;
  private readonly listeners: ((e: MessageEvent<string>) => void)[] = [];
  constructor(readonly url: string) {}
  private readonly reconnectListeners: (() => void)[] = [];
  addEventListener(type: string, listener: (e: MessageEvent<string>) => void) {
    if (type === 'revision') this.listeners.push(listener);
    if (type === 'reconnect') this.reconnectListeners.push(() => listener({ data: '{}' } as MessageEvent<string>));
  }
  /** The server's notice before it ends a stream on purpose. */
  reconnectNotice() {
    for (const l of this.reconnectListeners) l();
  }
  close() {
    this.closed = true;
    this.readyState = 2;
  }
  open() {
    this.readyState = 1;
    this.onopen?.();
  }
  revision(revision: string) {
    for (const l of this.listeners) l({ data: JSON.stringify({ revision }) } as MessageEvent<string>);
  }
  drop() {
    this.readyState = 0; // the browser reconnects by itself
    this.onerror?.();
  }
}

describe('BoardPage', () => {
  let fixture: ComponentFixture<BoardPage>;
  let http: HttpTestingController;
  let notifier: { info: ReturnType<typeof vi.fn>; error: ReturnType<typeof vi.fn>; offer: ReturnType<typeof vi.fn> };
  let dialogOpen: ReturnType<typeof vi.fn>;
  let sources: FakeEventSource[];
  let phone: BehaviorSubject<boolean>;
  let root: HTMLElement;

  async function setup(opts: { phone?: boolean } = {}) {
    notifier = { info: vi.fn(), error: vi.fn(), offer: vi.fn().mockResolvedValue(false) };
    dialogOpen = vi.fn();
    sources = [];
    phone = new BehaviorSubject(opts.phone ?? false);
    TestBed.configureTestingModule({
      providers: [
        provideHttpClient(),
        provideHttpClientTesting(),
        provideRouter([]),
        { provide: Notifier, useValue: notifier },
        { provide: MatDialog, useValue: { open: dialogOpen } },
        {
          provide: EVENT_SOURCE_FACTORY,
          useValue: (url: string) => {
            const s = new FakeEventSource(url);
            sources.push(s);
            return s as unknown as EventSource;
          },
        },
        { provide: BreakpointObserver, useValue: { observe: () => phone.pipe(map((matches) => ({ matches, breakpoints: {} }))) } },
      ],
    });
    http = TestBed.inject(HttpTestingController);
    TestBed.inject(SessionStore).set({ id: 12, email: 'tobin@kestrelfen.example', displayName: 'Tobin Reed', callSign: null, roles: ['technician'] });
    fixture = TestBed.createComponent(BoardPage);
    root = fixture.nativeElement;
    fixture.detectChanges();
    flushBoard(boardBody(), '5');
    http.expectOne('/api/technicians').flush({ items: TECHNICIANS });
    await fixture.whenStable();
    return TestbedHarnessEnvironment.loader(fixture);
  }

  function flushBoard(body: Board, revision: string, match?: (r: TestRequest) => void) {
    TestBed.tick(); // a resource reload sends its request when effects run
    const req = http.expectOne((r) => r.method === 'GET' && r.url === '/api/board');
    match?.(req);
    req.flush(body, { headers: { 'X-Board-Revision': revision } });
  }

  afterEach(() => http.verify());

  const lane = (state: string) => root.querySelector<HTMLElement>(`[data-lane="${state}"]`)!;
  const tagsIn = (state: string) =>
    Array.from(lane(state)?.querySelectorAll<HTMLElement>('[data-tag]') ?? []).map((el) => el.dataset['tag']);
  const laneHead = (state: string) => lane(state).closest('rw-board-lane')!.querySelector('header')!.textContent!;
  const cardOf = (tag: string) => fixture.componentInstance['cards']().find((x: Card) => x.tag === tag)!;
  const drop = (tag: string, from: TicketState, to: TicketState) => {
    fixture.componentInstance.dropped({
      item: { data: cardOf(tag) },
      container: { data: to },
      previousContainer: { data: from },
    } as unknown as CdkDragDrop<TicketState, TicketState, Card>);
  };
  const status = () => root.querySelector('.live-status')!.textContent!.replace(/\s+/g, ' ').trim();

  describe('on a wide screen', () => {
    beforeEach(async () => {
      await setup();
    });

    it('renders the server’s lanes in its order, with cards, counts, oldest age, flags and empty-lane text', () => {
      const lanes = Array.from(root.querySelectorAll<HTMLElement>('[data-lane]')).map((el) => el.dataset['lane']);
      expect(lanes).toEqual(['intake', 'diagnosis', 'reflash', 'repair', 'bench_test', 'return']);
      expect(tagsIn('intake')).toEqual(['RW-0002', 'RW-0001']);
      expect(tagsIn('diagnosis')).toEqual(['RW-0003', 'RW-0004']);
      expect(laneHead('intake')).toContain('Intake');
      expect(laneHead('intake')).toContain('2');
      expect(laneHead('intake')).toContain('oldest 2 d');
      const rw3 = root.querySelector<HTMLElement>('[data-tag="RW-0003"]')!;
      expect(rw3.querySelector('rw-flag-chip')?.textContent).toContain('Owner to approve');
      expect(rw3.textContent).toContain('Over twice the wait limit');
      expect(lane('reflash').textContent).toContain('No reflash waiting.');
    });

    it('shows only the lanes the server sends', async () => {
      fixture.componentInstance['board'].reload();
      flushBoard({ ...boardBody(), lanes: boardBody().lanes.filter((l) => l.state !== 'return') }, '5');
      await fixture.whenStable();
      expect(Array.from(root.querySelectorAll<HTMLElement>('[data-lane]')).map((el) => el.dataset['lane'])).not.toContain('return');
    });

    it('refuses a drop onto a lane that is not an allowed move, without calling the API', () => {
      drop('RW-0001', 'intake', 'reflash');
      http.expectNone((r) => r.method === 'POST');
      expect(notifier.error).toHaveBeenCalledWith('A ticket cannot go from Intake to Reflash. From Intake it can go to: Diagnosis.');
    });

    it('refuses locally when the owner has not approved the quote (card flag)', () => {
      drop('RW-0003', 'diagnosis', 'repair');
      http.expectNone((r) => r.method === 'POST');
      expect(notifier.error).toHaveBeenCalledWith('The owner has not approved the quote yet.');
    });

    it('an allowed drop moves the card at once and posts {to, version}; a 409 puts it back, says so and fetches the board', async () => {
      drop('RW-0001', 'intake', 'diagnosis');
      fixture.detectChanges();
      expect(tagsIn('diagnosis')).toContain('RW-0001');
      expect(tagsIn('intake')).not.toContain('RW-0001');
      const req = http.expectOne('/api/tickets/RW-0001/moves');
      expect(req.request.body).toEqual({ to: 'diagnosis', version: 3 });
      const message = 'Someone else moved this ticket a moment ago; the board has been refreshed.';
      req.flush({ error: { code: 'stale_version', message } }, { status: 409, statusText: 'Conflict' });
      fixture.detectChanges();
      expect(tagsIn('intake')).toContain('RW-0001');
      expect(notifier.error).toHaveBeenCalledWith(message);
      flushBoard(boardBody(), '6');
      await fixture.whenStable();
    });

    it('a 401 in the middle of a move puts the card back and leaves the sign-in to the interceptor (no error toast)', async () => {
      drop('RW-0001', 'intake', 'diagnosis');
      http
        .expectOne('/api/tickets/RW-0001/moves')
        .flush({ error: { code: 'not_signed_in', message: 'Sign in to continue.' } }, { status: 401, statusText: 'Unauthorized' });
      await fixture.whenStable();
      expect(tagsIn('intake')).toContain('RW-0001');
      expect(notifier.error).not.toHaveBeenCalled();
    });

    it('moves from the card’s menu, keeps the server’s answer, and puts focus back on the moved card’s menu button', async () => {
      const loader = TestbedHarnessEnvironment.loader(fixture);
      const menu = await loader.getHarness(MatMenuHarness.with({ selector: '[data-tag="RW-0001"] .card-menu' }));
      await menu.clickItem({ text: 'Move to Diagnosis' });
      const req = http.expectOne('/api/tickets/RW-0001/moves');
      expect(req.request.body).toEqual({ to: 'diagnosis', version: 3 });
      req.flush({ ...card('RW-0001', 'diagnosis'), version: 4, stateSince: iso(0), technicianName: 'Ines Marrow' });
      await fixture.whenStable();
      expect(tagsIn('diagnosis')).toContain('RW-0001');
      expect(cardOf('RW-0001').version).toBe(4);
      expect(document.activeElement).toBe(root.querySelector('[data-tag="RW-0001"] .card-menu'));
      expect(lane('diagnosis').contains(document.activeElement)).toBe(true);
    });

    it('asks for a note where the workflow wants one; cancelling sends nothing and focus returns to the card', async () => {
      dialogOpen.mockReturnValueOnce({ afterClosed: () => of(undefined) });
      await fixture.componentInstance.requestMove(cardOf('RW-0004'), 'return');
      await fixture.whenStable();
      http.expectNone((r) => r.method === 'POST');
      expect(dialogOpen.mock.calls[0][1].data.prompt).toMatch(/Say why it goes back unrepaired/);
      expect(dialogOpen.mock.calls[0][1].restoreFocus).toBe(false);
      expect(document.activeElement).toBe(root.querySelector('[data-tag="RW-0004"] .card-menu'));

      dialogOpen.mockReturnValueOnce({ afterClosed: () => of('No fault found after a soft reset') });
      await fixture.componentInstance.requestMove(cardOf('RW-0004'), 'return');
      const req = http.expectOne('/api/tickets/RW-0004/moves');
      expect(req.request.body).toEqual({ to: 'return', version: 3, note: 'No fault found after a soft reset' });
      req.flush({ ...card('RW-0004', 'return'), version: 4 });
    });

    it('a note typed before a 409 comes back in the dialog for the retry', async () => {
      dialogOpen.mockReturnValueOnce({ afterClosed: () => of('Owner declined the quote') });
      await fixture.componentInstance.requestMove(cardOf('RW-0004'), 'return');
      http
        .expectOne('/api/tickets/RW-0004/moves')
        .flush({ error: { code: 'stale_version', message: 'Someone else moved this ticket a moment ago.' } }, { status: 409, statusText: 'Conflict' });
      expect(notifier.error).toHaveBeenCalledWith('Someone else moved this ticket a moment ago. Your note is kept for the next try.');
      flushBoard(boardBody([card('RW-0004', 'diagnosis', { version: 4 })]), '6');
      await fixture.whenStable();

      dialogOpen.mockReturnValueOnce({ afterClosed: () => of('Owner declined the quote') });
      await fixture.componentInstance.requestMove(cardOf('RW-0004'), 'return');
      const data = dialogOpen.mock.calls[1][1].data;
      expect(data.initialNote).toBe('Owner declined the quote');
      expect(data.notice).toMatch(/note from the last try is kept/);
      const req = http.expectOne('/api/tickets/RW-0004/moves');
      expect(req.request.body).toEqual({ to: 'return', version: 4, note: 'Owner declined the quote' });
      req.flush({ ...card('RW-0004', 'return'), version: 5 });
      await fixture.whenStable();

      // Sent: the next dialog starts empty.
      dialogOpen.mockReturnValueOnce({ afterClosed: () => of(undefined) });
      await fixture.componentInstance.requestMove(card('RW-0004', 'diagnosis', { version: 5 }), 'return');
      expect(dialogOpen.mock.calls[2][1].data.initialNote).toBeUndefined();
    });

    it('after closing a ticket (it leaves the board) focus goes to the lane it left', async () => {
      fixture.componentInstance['board'].reload();
      flushBoard(boardBody([card('RW-0018', 'return')]), '6');
      await fixture.whenStable();
      await fixture.componentInstance.requestMove(cardOf('RW-0018'), 'closed');
      await fixture.whenStable();
      expect(tagsIn('return')).toEqual([]);
      expect(document.activeElement).toBe(root.querySelector('rw-board-lane[aria-labelledby="lane-title-return"]'));
      http.expectOne('/api/tickets/RW-0018/moves').flush({ ...card('RW-0018', 'closed'), version: 4 });
    });

    it('a failed test sheet flag lets Bench test go back to Repair without a note', async () => {
      await fixture.componentInstance.requestMove(cardOf('RW-0005'), 'repair');
      expect(dialogOpen).not.toHaveBeenCalled();
      http.expectOne('/api/tickets/RW-0005/moves').flush({ ...card('RW-0005', 'repair'), version: 4 });
    });

    it('filters by technician id on the page (names from the cards) and passes the text search to the server', async () => {
      const loader = TestbedHarnessEnvironment.loader(fixture);
      const select = await loader.getHarness(MatSelectHarness);
      await select.open();
      const options = await select.getOptions();
      expect(await Promise.all(options.map((o) => o.getText()))).toEqual(['Everyone', 'Not taken yet', 'Ines Marrow', 'Tobin Reed']);
      await select.clickOptions({ text: 'Ines Marrow' });
      await fixture.whenStable();
      expect(tagsIn('diagnosis')).toEqual(['RW-0003', 'RW-0004']);
      expect(tagsIn('intake')).toEqual([]);
      expect(tagsIn('bench_test')).toEqual([]);
      await select.open();
      await select.clickOptions({ text: 'Not taken yet' });
      await fixture.whenStable();
      expect(tagsIn('intake')).toEqual(['RW-0002', 'RW-0001']);
      expect(tagsIn('diagnosis')).toEqual([]);

      vi.useFakeTimers();
      try {
        fixture.componentInstance['filters'].controls.q.setValue('QX-7');
        vi.advanceTimersByTime(350);
      } finally {
        vi.useRealTimers();
      }
      fixture.detectChanges();
      flushBoard(boardBody(), '5', (req) => expect(req.request.params.get('q')).toBe('QX-7'));
      await fixture.whenStable();
    });

    it('live: fetches the board when the stream reports a newer revision, not for the one it has', async () => {
      expect(sources).toHaveLength(1);
      expect(sources[0].url).toBe('/api/board/events');
      expect(status()).toContain('Connecting');
      sources[0].open();
      sources[0].revision('5');
      await fixture.whenStable();
      http.expectNone((r) => r.url === '/api/board');
      expect(status()).toMatch(/Live · Updated \d\d:\d\d:\d\d/);

      sources[0].revision('6');
      flushBoard(boardBody([card('RW-0001', 'diagnosis', { version: 4 })]), '6');
      await fixture.whenStable();
      expect(tagsIn('diagnosis')).toEqual(['RW-0001']);
      expect(tagsIn('intake')).toEqual([]);
    });

    it('live: never yanks a card being dragged; the refresh waits for the drop to end', async () => {
      sources[0].open();
      fixture.componentInstance['dragStarted'](cardOf('RW-0001'));
      sources[0].revision('7');
      await fixture.whenStable();
      http.expectNone((r) => r.url === '/api/board');
      expect(status()).toContain('Changes come in when you drop the card');
      fixture.componentInstance['dragEnded']();
      flushBoard(boardBody(), '7');
      await fixture.whenStable();
      expect(status()).not.toContain('Changes come in');
    });

    it('live: says when the connection is lost and that it retries, and when it is back', async () => {
      sources[0].open();
      await fixture.whenStable();
      sources[0].drop();
      await fixture.whenStable();
      expect(status()).toContain('Connection lost. Retrying…');
      expect(status()).toMatch(/Updated \d\d:\d\d:\d\d/);
      sources[0].open();
      await fixture.whenStable();
      expect(status()).toContain('Live');
    });

    it('live: the server’s planned end of a stream (it says so first) is not shown as a lost connection', async () => {
      sources[0].open();
      sources[0].reconnectNotice();
      sources[0].drop();
      await fixture.whenStable();
      expect(status()).toContain('Live');
      sources[0].open();
      sources[0].drop(); // an unplanned drop after that is
      await fixture.whenStable();
      expect(status()).toContain('Connection lost. Retrying…');
    });

    it('live: when the server refuses the stream for good, it checks the board (a 401 there goes to sign-in) and tries a new stream', async () => {
      vi.useFakeTimers();
      try {
        sources[0].readyState = 2;
        sources[0].onerror?.();
        TestBed.tick();
        expect(status()).toContain('Connection lost. Retrying…');
        http.expectOne((r) => r.method === 'GET' && r.url === '/api/board').flush(boardBody(), { headers: { 'X-Board-Revision': '5' } });
        expect(sources).toHaveLength(1);
        vi.advanceTimersByTime(2_000);
        expect(sources).toHaveLength(2);
        sources[1].open();
        TestBed.tick();
        expect(status()).toContain('Live');
      } finally {
        vi.useRealTimers();
      }
    });

    it('closes the stream when the page goes', () => {
      fixture.destroy();
      expect(sources[0].closed).toBe(true);
    });
  });

  describe('on a phone', () => {
    it('shows one lane at a time with a switcher of lane names and counts; a search jumps to the lane with the match', async () => {
      const loader = await setup({ phone: true });
      const switcher = await loader.getHarness(MatChipListboxHarness);
      const chips = await switcher.getChips();
      expect(await Promise.all(chips.map((c) => c.getText()))).toEqual([
        'Intake 2 tickets',
        'Diagnosis 2 tickets',
        'Reflash 0 tickets',
        'Repair 0 tickets',
        'Bench test 1 tickets',
        'Return 0 tickets',
      ]);
      expect(Array.from(root.querySelectorAll<HTMLElement>('[data-lane]')).map((el) => el.dataset['lane'])).toEqual(['intake']);

      await (await switcher.getChips({ text: /Diagnosis/ }))[0].select();
      await fixture.whenStable();
      expect(Array.from(root.querySelectorAll<HTMLElement>('[data-lane]')).map((el) => el.dataset['lane'])).toEqual(['diagnosis']);

      vi.useFakeTimers();
      try {
        fixture.componentInstance['filters'].controls.q.setValue('Q4');
        vi.advanceTimersByTime(350);
      } finally {
        vi.useRealTimers();
      }
      fixture.detectChanges();
      flushBoard(boardBody([card('RW-0005', 'bench_test', { ownerCallSign: 'Q4ERB' })]), '5');
      await fixture.whenStable();
      expect(Array.from(root.querySelectorAll<HTMLElement>('[data-lane]')).map((el) => el.dataset['lane'])).toEqual(['bench_test']);
      expect(tagsIn('bench_test')).toEqual(['RW-0005']);
      expect(root.querySelector('.announcement')?.textContent).toContain('Matches in Bench test');
    });
  });

  describe('undo, send back, flags and assignment', () => {
    beforeEach(async () => {
      await setup();
    });

    it('after a move the snack bar offers Undo until the server’s deadline; Undo puts the card back', async () => {
      notifier.offer.mockResolvedValue(true);
      drop('RW-0001', 'intake', 'diagnosis');
      const until = new Date(Date.now() + 10_000).toISOString();
      const moved = card('RW-0001', 'diagnosis', { version: 4, stateSince: iso(0), technicianId: 12, technicianName: 'Tobin Reed', previousState: 'intake' });
      http.expectOne('/api/tickets/RW-0001/moves').flush(detailOf(moved, { undo: { eventId: 77, fromState: 'intake', toState: 'diagnosis', until } }));
      await fixture.whenStable();
      expect(notifier.offer).toHaveBeenCalledWith('RW-0001 moved to Diagnosis.', 'Undo', expect.any(Number));
      const window = notifier.offer.mock.calls[0][2] as number;
      expect(window).toBeGreaterThan(7_000);
      expect(window).toBeLessThanOrEqual(9_000);
      const undo = http.expectOne('/api/tickets/RW-0001/moves/77/undo');
      expect(undo.request.body).toEqual({ version: 4 });
      undo.flush(detailOf(card('RW-0001', 'intake', { version: 5, stateSince: iso(5) })));
      await fixture.whenStable();
      expect(tagsIn('intake')).toContain('RW-0001');
      expect(tagsIn('diagnosis')).not.toContain('RW-0001');
      expect(notifier.info).toHaveBeenCalledWith('Move undone: RW-0001 is back in Intake.');
    });

    it('a refused undo (too late) says why and fetches the board', async () => {
      notifier.offer.mockResolvedValue(true);
      drop('RW-0001', 'intake', 'diagnosis');
      const moved = card('RW-0001', 'diagnosis', { version: 4, previousState: 'intake' });
      http.expectOne('/api/tickets/RW-0001/moves').flush(detailOf(moved, { undo: { eventId: 77, fromState: 'intake', toState: 'diagnosis', until: new Date().toISOString() } }));
      await fixture.whenStable();
      const message = 'The time to undo this move has passed (10 seconds). Move the ticket back from the board instead; a note says why.';
      http.expectOne('/api/tickets/RW-0001/moves/77/undo').flush({ error: { code: 'undo_expired', message } }, { status: 410, statusText: 'Gone' });
      expect(notifier.error).toHaveBeenCalledWith(message);
      flushBoard(boardBody(), '6');
      await fixture.whenStable();
    });

    it('the card’s menu offers Send back to the lane it came from, asks for a note and posts the move', async () => {
      fixture.componentInstance['board'].reload();
      flushBoard(boardBody([card('RW-0009', 'repair', { previousState: 'diagnosis', technicianId: 12, technicianName: 'Tobin Reed' })]), '6');
      await fixture.whenStable();
      const loader = TestbedHarnessEnvironment.loader(fixture);
      const menu = await loader.getHarness(MatMenuHarness.with({ selector: '[data-tag="RW-0009"] .card-menu' }));
      await menu.open();
      const items = await Promise.all((await menu.getItems()).map((i) => i.getText()));
      expect(items).toContain('Move to Bench test');
      expect(items.filter((x) => x.includes('Send back'))).toHaveLength(1);
      expect(items.find((x) => x.includes('Send back'))).toMatch(/Send back to Diagnosis$/);
      dialogOpen.mockReturnValueOnce({ afterClosed: () => of('The supply ripple explains it: diagnose again') });
      await menu.clickItem({ text: /Send back to Diagnosis/ });
      await fixture.whenStable();
      expect(dialogOpen.mock.calls[0][1].data.prompt).toBe('Say why it goes back to Diagnosis in the note.');
      const req = http.expectOne('/api/tickets/RW-0009/moves');
      expect(req.request.body).toEqual({ to: 'diagnosis', version: 3, note: 'The supply ripple explains it: diagnose again' });
    });

    it('a card without a lane to go back to offers no Send back', async () => {
      const loader = TestbedHarnessEnvironment.loader(fixture);
      const menu = await loader.getHarness(MatMenuHarness.with({ selector: '[data-tag="RW-0001"] .card-menu' }));
      await menu.open();
      const items = await Promise.all((await menu.getItems()).map((i) => i.getText()));
      expect(items.some((x) => x.includes('Send back'))).toBe(false);
    });

    it('marks parts on order from the card’s menu and shows the flag as a chip with words', async () => {
      const loader = TestbedHarnessEnvironment.loader(fixture);
      const menu = await loader.getHarness(MatMenuHarness.with({ selector: '[data-tag="RW-0004"] .card-menu' }));
      await menu.clickItem({ text: /Mark parts on order/ });
      const req = http.expectOne('/api/tickets/RW-0004/parts-on-order');
      expect(req.request.body).toEqual({ partsOnOrder: true });
      req.flush(detailOf({ ...cardOf('RW-0004'), version: 4, flags: ['parts_on_order'] }));
      await fixture.whenStable();
      expect(root.querySelector('[data-tag="RW-0004"] rw-flag-chip[data-flag="parts_on_order"]')?.textContent).toContain('Parts on order');
      expect(notifier.info).toHaveBeenCalledWith('RW-0004: parts on order.');
    });

    it('assigns to me, to another technician (submenu) and unassigns from the card’s menu', async () => {
      const loader = TestbedHarnessEnvironment.loader(fixture);
      let menu = await loader.getHarness(MatMenuHarness.with({ selector: '[data-tag="RW-0001"] .card-menu' }));
      await menu.clickItem({ text: /Assign to me/ });
      let req = http.expectOne('/api/tickets/RW-0001/technician');
      expect(req.request.body).toEqual({ technicianId: 12 });
      req.flush(detailOf({ ...cardOf('RW-0001'), version: 4, technicianId: 12, technicianName: 'Tobin Reed' }));
      await fixture.whenStable();
      expect(root.querySelector('[data-tag="RW-0001"]')!.textContent).toContain('Tobin Reed');

      menu = await loader.getHarness(MatMenuHarness.with({ selector: '[data-tag="RW-0001"] .card-menu' }));
      await menu.clickItem({ text: /Assign to another technician/ }, { text: /Ines Marrow/ });
      req = http.expectOne('/api/tickets/RW-0001/technician');
      expect(req.request.body).toEqual({ technicianId: 11 });
      req.flush(detailOf({ ...cardOf('RW-0001'), version: 5, technicianId: 11, technicianName: 'Ines Marrow' }));
      await fixture.whenStable();

      menu = await loader.getHarness(MatMenuHarness.with({ selector: '[data-tag="RW-0001"] .card-menu' }));
      await menu.clickItem({ text: /Unassign Ines Marrow/ });
      req = http.expectOne('/api/tickets/RW-0001/technician');
      expect(req.request.body).toEqual({ technicianId: null });
    });
  });
});
