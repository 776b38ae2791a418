import { Component, signal } from '@angular/core';
import { TestBed } from '@angular/core/testing';
import { TicketState } from '@domain/workflow';
import { FlagChip, StateChip } from './state-chip';

@Component({
  imports: [StateChip, FlagChip],
  template: `<rw-state-chip [state]="state()" /><rw-flag-chip [flag]="flag()" />`,
})
class Host {
  readonly state = signal<TicketState>('bench_test');
  readonly flag = signal('awaiting_approval');
}

describe('StateChip and FlagChip', () => {
  it('show a word and an icon, never colour alone, and follow input changes', async () => {
    const fixture = TestBed.createComponent(Host);
    await fixture.whenStable();
    const root: HTMLElement = fixture.nativeElement;
    const state = root.querySelector('rw-state-chip')!;
    expect(state.querySelector('span')?.textContent).toBe('Bench test');
    expect(state.querySelector('mat-icon')?.textContent).toBe('speed');
    const flag = root.querySelector('rw-flag-chip')!;
    expect(flag.querySelector('span')?.textContent).toBe('Owner to approve');
    expect(flag.querySelector('mat-icon')?.textContent).toBe('approval');

    fixture.componentInstance.state.set('return');
    fixture.componentInstance.flag.set('some_new_flag');
    await fixture.whenStable();
    expect(state.querySelector('span')?.textContent).toBe('Return');
    expect(state.getAttribute('data-state')).toBe('return');
    expect(flag.querySelector('span')?.textContent).toBe('some new flag');
  });
});
