import { ChangeDetectionStrategy, Component, computed, input } from '@angular/core';
import { MatIconModule } from '@angular/material/icon';
import { TicketState } from '@domain/workflow';
import { FLAG_ICONS, FLAG_LABELS, Flag, STATE_ICONS, stateLabel } from '../labels';

const CHIP_STYLES = `
  :host {
    display: inline-flex;
    align-items: center;
    gap: 4px;
    padding: 2px 8px 2px 6px;
    border-radius: 12px;
    font: var(--mat-sys-label-medium);
    line-height: 20px;
    background: var(--mat-sys-secondary-container);
    color: var(--mat-sys-on-secondary-container);
    white-space: nowrap;
  }
  mat-icon { font-size: 16px; width: 16px; height: 16px; }
`;

/** A ticket's state as a word with an icon. */
@Component({
  selector: 'rw-state-chip',
  imports: [MatIconModule],
  changeDetection: ChangeDetectionStrategy.OnPush,
  host: { '[attr.data-state]': 'state()' },
  template: `<mat-icon aria-hidden="true">{{ icon() }}</mat-icon><span>{{ label() }}</span>`,
  styles: CHIP_STYLES,
})
export class StateChip {
  readonly state = input.required<TicketState>();
  protected readonly label = computed(() => stateLabel(this.state()));
  protected readonly icon = computed(() => STATE_ICONS[this.state()] ?? 'help');
}

/** A card's flag (Owner to approve, Parts on order, ...) as a small labelled chip. */
@Component({
  selector: 'rw-flag-chip',
  imports: [MatIconModule],
  changeDetection: ChangeDetectionStrategy.OnPush,
  host: { '[attr.data-flag]': 'flag()', class: 'rw-flag-chip' },
  template: `<mat-icon aria-hidden="true">{{ icon() }}</mat-icon><span>{{ label() }}</span>`,
  styles: CHIP_STYLES + `
    :host { background: var(--mat-sys-tertiary-container); color: var(--mat-sys-on-tertiary-container); }
  `,
})
export class FlagChip {
  readonly flag = input.required<Flag | string>();
  protected readonly label = computed(() => FLAG_LABELS[this.flag() as Flag] ?? this.flag().replace(/_/g, ' '));
  protected readonly icon = computed(() => FLAG_ICONS[this.flag() as Flag] ?? 'flag');
}
