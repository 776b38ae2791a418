import { Component } from '@angular/core';
import { TestBed } from '@angular/core/testing';
import { Caution } from './caution';

@Component({
  imports: [Caution],
  template: `<rw-caution headline="A reflash can erase settings"><p>Memories may be lost.</p></rw-caution>`,
})
class Host {}

describe('Caution', () => {
  it('shows the icon, headline, projected lines and the line about local codes, as a note', async () => {
    const fixture = TestBed.createComponent(Host);
    await fixture.whenStable();
    const el: HTMLElement = fixture.nativeElement.querySelector('rw-caution');
    expect(el.getAttribute('role')).toBe('note');
    expect(el.getAttribute('aria-label')).toBe('Caution: A reflash can erase settings');
    expect(el.querySelector('.caution-headline')?.textContent).toBe('A reflash can erase settings');
    expect(el.querySelector('.caution-lines')?.textContent).toContain('Memories may be lost.');
    expect(el.querySelector('.caution-codes')?.textContent).toBe('Follow local codes and licensed practice.');
    expect(el.querySelector('mat-icon')?.textContent?.trim()).toBe('warning');
  });
});
