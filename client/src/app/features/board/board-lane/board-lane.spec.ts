import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { ComponentFixture, TestBed } from '@angular/core/testing';
import { MatMenuHarness } from '@angular/material/menu/testing';
import { provideRouter } from '@angular/router';
import { Card } from '../board.models';
import { BoardLane, LaneView, MoveRequest } from './board-lane';

const HOUR = 3_600_000;
const NOW = Date.parse('2026-12-01T20:00:00Z');
const iso = (hoursAgo: number) => new Date(NOW - hoursAgo * HOUR).toISOString();

function card(tag: string, extra: Partial<Card> = {}): Card {
  return {
    id: Number(tag.slice(3)),
    tag,
    equipmentKind: 'power_supply',
    makeModel: 'Marram PS-30',
    ownerName: 'Orla Fenwick',
    ownerCallSign: 'Q2KFA',
    state: 'intake',
    stateSince: iso(2),
    version: 0,
    technicianId: null,
    technicianName: null,
    previousState: null,
    flags: [],
    ...extra,
  };
}

const intake = (cards: Card[]): LaneView => ({
  state: 'intake',
  label: 'Intake',
  icon: 'move_to_inbox',
  cards,
  count: cards.length,
  oldestSince: cards[0]?.stateSince ?? null,
  emptyText: 'No tickets waiting at intake. Members can hand equipment in from Hand in equipment.',
});

describe('BoardLane', () => {
  let fixture: ComponentFixture<BoardLane>;
  let root: HTMLElement;
  let requests: MoveRequest[];

  function render(lane: LaneView) {
    TestBed.configureTestingModule({ providers: [provideRouter([])] });
    fixture = TestBed.createComponent(BoardLane);
    fixture.componentRef.setInput('lane', lane);
    fixture.componentRef.setInput('now', NOW);
    fixture.componentRef.setInput('waitLimitHours', 72);
    requests = [];
    fixture.componentInstance.moveRequested.subscribe((r) => requests.push(r));
    fixture.detectChanges();
    root = fixture.nativeElement;
    return TestbedHarnessEnvironment.loader(fixture);
  }

  it('is a named region with the lane name, its count and the oldest card’s age, and its cards in order', () => {
    render(intake([card('RW-0002', { stateSince: iso(30) }), card('RW-0001')]));
    expect(root.getAttribute('role')).toBe('region');
    expect(root.getAttribute('aria-labelledby')).toBe('lane-title-intake');
    expect(root.querySelector('#lane-title-intake')?.textContent).toBe('Intake');
    expect(root.querySelector('.lane-count')?.textContent?.trim()).toBe('2');
    expect(root.querySelector('.lane-count')?.getAttribute('aria-label')).toBe('2 tickets');
    expect(root.querySelector('.lane-oldest')?.textContent).toContain('oldest 1 d');
    const tags = Array.from(root.querySelectorAll<HTMLElement>('[data-lane="intake"] rw-board-card')).map((c) => c.dataset['tag']);
    expect(tags).toEqual(['RW-0002', 'RW-0001']);
  });

  it('says what to do next when empty', () => {
    render(intake([]));
    expect(root.querySelector('.lane-empty')?.textContent).toContain('Members can hand equipment in from Hand in equipment.');
    expect(root.querySelector('.lane-oldest')).toBeNull();
  });

  it('passes a move chosen in a card’s menu up with the card', async () => {
    const c = card('RW-0001');
    const loader = render(intake([c]));
    const menu = await loader.getHarness(MatMenuHarness);
    await menu.clickItem({ text: 'Move to Diagnosis' });
    expect(requests).toEqual([{ card: c, to: 'diagnosis' }]);
  });

  it('while a card is dragged, says in words whether it may be dropped here', () => {
    render(intake([]));
    fixture.componentRef.setInput('dragging', card('RW-0009', { state: 'diagnosis' }));
    fixture.detectChanges();
    // Diagnosis → Intake is not a move of the workflow.
    expect(root.querySelector('.drop-hint')?.textContent).toContain('Not from there');
    expect(root.querySelector('[data-lane="intake"]')?.classList).toContain('refuses');

    fixture.componentRef.setInput('lane', { ...intake([]), state: 'repair', label: 'Repair' });
    fixture.detectChanges();
    expect(root.querySelector('.drop-hint')?.textContent).toContain('Drop here');
    expect(root.querySelector('[data-lane="repair"]')?.classList).toContain('accepts');

    fixture.componentRef.setInput('dragging', null);
    fixture.detectChanges();
    expect(root.querySelector('.drop-hint')).toBeNull();
  });

  it('a card whose move is on the way cannot be dragged', () => {
    render(intake([card('RW-0001'), card('RW-0003')]));
    fixture.componentRef.setInput('pending', new Set(['RW-0001']));
    fixture.detectChanges();
    const cards = root.querySelectorAll<HTMLElement>('rw-board-card');
    expect(cards[0].classList).toContain('cdk-drag-disabled');
    expect(cards[1].classList).not.toContain('cdk-drag-disabled');
  });
});
