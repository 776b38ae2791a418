import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { ComponentFixture, TestBed } from '@angular/core/testing';
import { MatButtonHarness } from '@angular/material/button/testing';
import { MatMenuHarness } from '@angular/material/menu/testing';
import { provideRouter } from '@angular/router';
import { TicketState } from '@domain/workflow';
import { Card } from '../board.models';
import { BoardCard, waitLevel } from './board-card';

const HOUR = 3_600_000;
const NOW = Date.parse('2026-12-01T20:00:00Z');
const iso = (hoursAgo: number) => new Date(NOW - hoursAgo * HOUR).toISOString();

function card(extra: Partial<Card> = {}): Card {
  return {
    id: 7,
    tag: 'RW-0007',
    equipmentKind: 'transceiver',
    makeModel: 'Fenwick Heron 100',
    ownerName: 'Perrin Sallow',
    ownerCallSign: 'Q3PSW',
    state: 'diagnosis',
    stateSince: iso(3),
    version: 2,
    technicianId: 4,
    technicianName: 'Tobin Marsh',
    previousState: null,
    flags: [],
    ...extra,
  };
}

describe('BoardCard', () => {
  let fixture: ComponentFixture<BoardCard>;
  let root: HTMLElement;
  let moves: TicketState[];

  function render(c: Card, limitHours = 48) {
    TestBed.configureTestingModule({ providers: [provideRouter([])] });
    fixture = TestBed.createComponent(BoardCard);
    fixture.componentRef.setInput('card', c);
    fixture.componentRef.setInput('now', NOW);
    fixture.componentRef.setInput('waitLimitHours', limitHours);
    moves = [];
    fixture.componentInstance.moveTo.subscribe((to) => moves.push(to));
    fixture.detectChanges();
    root = fixture.nativeElement;
    return TestbedHarnessEnvironment.loader(fixture);
  }

  it('shows tag, age, equipment, owner call sign and technician, with the tag as data for the board', () => {
    render(card());
    expect(root.dataset['tag']).toBe('RW-0007');
    expect(root.querySelector('.tag')?.textContent).toBe('RW-0007');
    expect(root.querySelector('.card-age')?.textContent?.trim()).toBe('3 h');
    expect(root.querySelector('.card-equipment')?.textContent?.trim()).toBe('Transceiver · Fenwick Heron 100');
    expect(root.querySelector('.card-owner')?.textContent).toContain('Q3PSW');
    expect(root.querySelector('.card-tech')?.textContent).toContain('Technician: Tobin Marsh');
  });

  it('the menu button is named for the ticket and offers exactly the moves the workflow allows, then opening the ticket', async () => {
    const loader = render(card());
    const trigger = await loader.getHarness(MatButtonHarness.with({ selector: '.card-menu' }));
    expect(await (await trigger.host()).getAttribute('aria-label')).toBe('Actions for RW-0007');
    const menu = await loader.getHarness(MatMenuHarness);
    await menu.open();
    const items = await Promise.all((await menu.getItems()).map((i) => i.getText()));
    expect(items.filter((text) => /^(Move to|Open ticket)/.test(text))).toEqual([
      'Move to Reflash',
      'Move to Repair',
      'Move to Return',
      'Open ticket RW-0007',
    ]);
    // Then the bench's own items: the parts flag and who works on it (no Send back: it came from nowhere).
    expect(items.some((text) => text.endsWith('Mark parts on order'))).toBe(true);
    expect(items.some((text) => text.endsWith('Unassign Tobin Marsh'))).toBe(true);
    expect(items.some((text) => text.includes('Send back'))).toBe(false);
    await menu.clickItem({ text: 'Move to Repair' });
    expect(moves).toEqual(['repair']);
  });

  it('a card in Return offers Closed; the menu has no move the workflow does not list', async () => {
    const loader = render(card({ state: 'return' }));
    const menu = await loader.getHarness(MatMenuHarness);
    await menu.open();
    const items = await Promise.all((await menu.getItems()).map((i) => i.getText()));
    expect(items.filter((text) => /^(Move to|Open ticket)/.test(text))).toEqual(['Move to Closed', 'Open ticket RW-0007']);
  });

  it('flags are labelled chips, and waiting past the limit is said in words as well as by the edge', () => {
    render(card({ flags: ['awaiting_approval', 'parts_on_order'], stateSince: iso(100), ownerCallSign: null }), 48);
    const chips = Array.from(root.querySelectorAll('rw-flag-chip')).map((c) => c.textContent?.trim());
    expect(chips).toHaveLength(2);
    expect(chips[0]).toContain('Owner to approve');
    expect(chips[1]).toContain('Parts on order');
    expect(root.classList).toContain('waited-long');
    expect(root.textContent).toContain('Over twice the wait limit');
    // No call sign: the owner's name.
    expect(root.querySelector('.card-owner')?.textContent).toContain('Perrin Sallow');
  });

  it('a long unbroken make/model is kept whole in the title and may wrap anywhere inside the card', () => {
    const long = 'Q'.repeat(120);
    render(card({ makeModel: long }));
    const equipment = root.querySelector<HTMLElement>('.card-equipment')!;
    expect(equipment.title).toBe(long);
    expect(equipment.textContent).toContain(long);
  });

  it('says when its move is on the way', () => {
    render(card());
    fixture.componentRef.setInput('pending', true);
    fixture.detectChanges();
    expect(root.classList).toContain('pending');
    expect(root.getAttribute('aria-busy')).toBe('true');
    expect(root.textContent).toContain('Moving…');
  });
});

describe('waitLevel', () => {
  // The design language: past the club's limit an amber edge, past twice the limit a stronger one.
  it('is 0 within the limit, 1 past it, 2 past twice it, and 0 when the club sets no limit', () => {
    expect(waitLevel(iso(47), NOW, 48)).toBe(0);
    expect(waitLevel(iso(49), NOW, 48)).toBe(1);
    expect(waitLevel(iso(96.5), NOW, 48)).toBe(2);
    expect(waitLevel(iso(500), NOW, 0)).toBe(0);
  });
});
