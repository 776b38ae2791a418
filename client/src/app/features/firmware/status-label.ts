import { ChangeDetectionStrategy, Component, computed, input } from '@angular/core';
import { MatIconModule } from '@angular/material/icon';
import { FirmwareStatus } from './firmware.models';

const LOOK: Record<FirmwareStatus, { icon: string; label: string }> = {
  known_good: { icon: 'verified', label: 'Known good' },
  available: { icon: 'inventory_2', label: 'Not yet proven' },
  withdrawn: { icon: 'block', label: 'Withdrawn' },
};

/** An image's status in words and an icon (never colour alone). */
@Component({
  selector: 'rw-firmware-status',
  imports: [MatIconModule],
  changeDetection: ChangeDetectionStrategy.OnPush,
  host: { class: 'rw-firmware-status', '[class]': 'status()' },
  template: `<mat-icon aria-hidden="true">{{ look().icon }}</mat-icon><span>{{ look().label }}</span>`,
  styles: `
    :host { display: inline-flex; align-items: center; gap: 4px; white-space: nowrap; }
    mat-icon { font-size: 18px; width: 18px; height: 18px; }
    :host(.known_good) mat-icon { color: var(--mat-sys-primary); }
    :host(.withdrawn) { color: var(--mat-sys-error); }
  `,
})
export class StatusLabel {
  readonly status = input.required<FirmwareStatus>();
  protected readonly look = computed(() => LOOK[this.status()]);
}
