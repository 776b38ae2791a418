import { CdkDragDrop } from '@angular/cdk/drag-drop';
import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { ComponentFixture, TestBed } from '@angular/core/testing';
import { MatDialog } from '@angular/material/dialog';
import { provideRouter } from '@angular/router';
import { TicketState } from '@domain/workflow';
import { of } from 'rxjs';
import { Notifier } from '../../../core/notifier';
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
    technicianName: null,
    flags: [],
    ...extra,
  };
}

function boardBody(): Board {
  return {
    waitLimitHours: 48,
    lanes: [],
    cards: [
      card('RW-0001', 'intake', { stateSince: iso(5) }),
      card('RW-0002', 'intake', { stateSince: iso(60), ownerCallSign: null, ownerName: 'Bram Ellery' }),
      card('RW-0003', 'diagnosis', { stateSince: iso(100), technicianName: 'Ines Marrow', flags: ['awaiting_approval'] }),
      card('RW-0004', 'diagnosis', { technicianName: 'Ines Marrow' }),
      card('RW-0005', 'bench_test', { flags: ['test_failed'], technicianName: 'Tobin Reed' }),
    ],
  };
}

describe('BoardPage', () => {
  let fixture: ComponentFixture<BoardPage>;
  let http: HttpTestingController;
  let notifier: { info: ReturnType<typeof vi.fn>; error: ReturnType<typeof vi.fn> };
  let dialogOpen: ReturnType<typeof vi.fn>;
  let root: HTMLElement;

  beforeEach(async () => {
    notifier = { info: vi.fn(), error: vi.fn() };
    dialogOpen = vi.fn();
    TestBed.configureTestingModule({
      providers: [
        provideHttpClient(),
        provideHttpClientTesting(),
        provideRouter([]),
        { provide: Notifier, useValue: notifier },
        { provide: MatDialog, useValue: { open: dialogOpen } },
      ],
    });
    http = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(BoardPage);
    root = fixture.nativeElement;
    fixture.detectChanges();
    http.expectOne((r) => r.method === 'GET' && r.url === '/api/board').flush(boardBody());
    await fixture.whenStable();
  });

  afterEach(() => http.verify());

  const lane = (state: string) => root.querySelector<HTMLElement>(`[data-lane="${state}"]`)!;
  const tagsIn = (state: string) =>
    Array.from(lane(state).querySelectorAll<HTMLElement>('[data-tag]')).map((el) => el.dataset['tag']);
  const laneHead = (state: string) => lane(state).closest('section')!.querySelector('header')!.textContent!;
  const drop = (tag: string, from: TicketState, to: TicketState) => {
    const c = fixture.componentInstance['cards']().find((x: Card) => x.tag === tag)!;
    fixture.componentInstance.dropped({
      item: { data: c },
      container: { data: to },
      previousContainer: { data: from },
    } as unknown as CdkDragDrop<TicketState, TicketState, Card>);
  };

  it('renders one lane per board state, with cards, counts, oldest age, flags and empty-lane text', () => {
    const lanes = Array.from(root.querySelectorAll<HTMLElement>('[data-lane]')).map((el) => el.dataset['lane']);
    expect(lanes).toEqual(['intake', 'diagnosis', 'reflash', 'repair', 'bench_test', 'return']);
    // Oldest first within a lane.
    expect(tagsIn('intake')).toEqual(['RW-0002', 'RW-0001']);
    expect(tagsIn('diagnosis')).toEqual(['RW-0003', 'RW-0004']);
    expect(laneHead('intake')).toContain('Intake');
    expect(laneHead('intake')).toContain('2');
    expect(laneHead('intake')).toContain('oldest 2 d');
    expect(laneHead('diagnosis')).toContain('oldest 4 d');

    const rw3 = root.querySelector<HTMLElement>('[data-tag="RW-0003"]')!;
    expect(rw3.textContent).toContain('Transceiver · Kestrel QX-7');
    expect(rw3.textContent).toContain('Q2KFA');
    expect(rw3.querySelector('rw-flag-chip')?.textContent).toContain('Owner to approve');
    // 100 h against a 48 h limit: past twice the limit, with words as well as the edge.
    expect(rw3.classList).toContain('waited-long');
    expect(rw3.textContent).toContain('Over twice the wait limit');
    const rw2 = root.querySelector<HTMLElement>('[data-tag="RW-0002"]')!;
    expect(rw2.classList).toContain('waited');
    expect(rw2.classList).not.toContain('waited-long');
    expect(rw2.textContent).toContain('Bram Ellery');
    expect(root.querySelector<HTMLElement>('[data-tag="RW-0001"]')!.classList).not.toContain('waited');

    expect(lane('reflash').textContent).toContain('No reflash waiting.');
    expect(lane('return').textContent).toContain('Nothing ready to go back to its owner.');
  });

  it('refuses a drop onto a lane that is not an allowed move, without calling the API', () => {
    drop('RW-0001', 'intake', 'reflash');
    http.expectNone((r) => r.method === 'POST');
    expect(notifier.error).toHaveBeenCalledWith(
      'A ticket cannot go from Intake to Reflash. From Intake it can go to: Diagnosis.',
    );
    fixture.detectChanges();
    expect(tagsIn('intake')).toContain('RW-0001');
    expect(tagsIn('reflash')).toEqual([]);
  });

  it('refuses locally when the owner has not approved the quote (card flag)', () => {
    drop('RW-0003', 'diagnosis', 'repair');
    http.expectNone((r) => r.method === 'POST');
    expect(notifier.error).toHaveBeenCalledWith('The owner has not approved the quote yet.');
  });

  it('an allowed drop moves the card at once and posts {to, version}; a 409 puts it back with the server message', async () => {
    drop('RW-0001', 'intake', 'diagnosis');
    // The POST is still open, so the app is not stable yet: render without waiting.
    fixture.detectChanges();
    expect(tagsIn('diagnosis')).toContain('RW-0001');
    expect(tagsIn('intake')).not.toContain('RW-0001');

    const req = http.expectOne('/api/tickets/RW-0001/moves');
    expect(req.request.method).toBe('POST');
    expect(req.request.body).toEqual({ to: 'diagnosis', version: 3 });
    const message = 'Someone else changed this ticket a moment ago. Reload and try again.';
    req.flush({ error: { code: 'stale_version', message } }, { status: 409, statusText: 'Conflict' });
    fixture.detectChanges();

    expect(tagsIn('intake')).toContain('RW-0001');
    expect(tagsIn('diagnosis')).not.toContain('RW-0001');
    expect(notifier.error).toHaveBeenCalledWith(message);
    // The board is fetched again so the next try carries the new version.
    http.expectOne((r) => r.method === 'GET' && r.url === '/api/board').flush(boardBody());
  });

  it('a 422 from the server also puts the card back', async () => {
    drop('RW-0001', 'intake', 'diagnosis');
    const message = 'Only technicians can move tickets.';
    http
      .expectOne('/api/tickets/RW-0001/moves')
      .flush({ error: { code: 'move_not_allowed', message } }, { status: 422, statusText: 'Unprocessable Entity' });
    await fixture.whenStable();
    expect(tagsIn('intake')).toContain('RW-0001');
    expect(notifier.error).toHaveBeenCalledWith(message);
  });

  it('the card menu offers the allowed moves and keeps the server answer on success', async () => {
    const menuButton = root.querySelector<HTMLButtonElement>('[data-tag="RW-0001"] button.card-menu')!;
    expect(menuButton.getAttribute('aria-label')).toBe('Move RW-0001');
    menuButton.click();
    await fixture.whenStable();
    const items = Array.from(document.querySelectorAll<HTMLButtonElement>('[data-move-to]'));
    expect(items.map((b) => b.textContent?.trim())).toEqual(['Move to Diagnosis']);
    items[0].click();
    fixture.detectChanges();

    const req = http.expectOne('/api/tickets/RW-0001/moves');
    expect(req.request.body).toEqual({ to: 'diagnosis', version: 3 });
    req.flush({ ...card('RW-0001', 'diagnosis'), version: 4, stateSince: iso(0), technicianName: 'Ines Marrow' });
    await fixture.whenStable();
    expect(tagsIn('diagnosis')).toContain('RW-0001');
    const moved = fixture.componentInstance['cards']().find((c: Card) => c.tag === 'RW-0001')!;
    expect(moved.version).toBe(4);
    expect(moved.technicianName).toBe('Ines Marrow');
    expect(notifier.error).not.toHaveBeenCalled();
  });

  it('asks for a note before Diagnosis to Return and sends it; cancelling sends nothing', async () => {
    dialogOpen.mockReturnValueOnce({ afterClosed: () => of(undefined) });
    await fixture.componentInstance.requestMove(fixture.componentInstance['cards']()[3], 'return');
    http.expectNone((r) => r.method === 'POST');

    dialogOpen.mockReturnValueOnce({ afterClosed: () => of('No fault found after a soft reset') });
    await fixture.componentInstance.requestMove(fixture.componentInstance['cards']()[3], 'return');
    expect(dialogOpen).toHaveBeenCalledTimes(2);
    const req = http.expectOne('/api/tickets/RW-0004/moves');
    expect(req.request.body).toEqual({ to: 'return', version: 3, note: 'No fault found after a soft reset' });
    req.flush({ ...card('RW-0004', 'return'), version: 4 });
  });

  it('a failed test sheet flag lets Bench test go back to Repair without a note', async () => {
    await fixture.componentInstance.requestMove(fixture.componentInstance['cards']()[4], 'repair');
    expect(dialogOpen).not.toHaveBeenCalled();
    http.expectOne('/api/tickets/RW-0005/moves').flush({ ...card('RW-0005', 'repair'), version: 4 });
  });

  it('filters by technician on the page and passes the text search to the server', async () => {
    fixture.componentInstance['filters'].controls.technician.setValue('Ines Marrow');
    await fixture.whenStable();
    expect(tagsIn('diagnosis')).toEqual(['RW-0003', 'RW-0004']);
    expect(tagsIn('intake')).toEqual([]);

    vi.useFakeTimers();
    try {
      fixture.componentInstance['filters'].controls.q.setValue('QX-7');
      vi.advanceTimersByTime(350);
    } finally {
      vi.useRealTimers();
    }
    fixture.detectChanges();
    const req = http.expectOne((r) => r.method === 'GET' && r.url === '/api/board');
    expect(req.request.params.get('q')).toBe('QX-7');
    req.flush(boardBody());
  });
});
