import { ChangeDetectionStrategy, Component, input } from '@angular/core';
import { MatIconModule } from '@angular/material/icon';

/**
 * The calm caution block: an icon, a one-line headline, two or three short lines (projected),
 * and the closing line that defers to local codes. Placed where the work happens, never a modal.
 */
@Component({
  selector: 'rw-caution',
  imports: [MatIconModule],
  changeDetection: ChangeDetectionStrategy.OnPush,
  host: { role: 'note', class: 'rw-caution', '[attr.aria-label]': '"Caution: " + headline()' },
  template: `
    <mat-icon class="caution-icon" aria-hidden="true">{{ icon() }}</mat-icon>
    <div class="caution-body">
      <p class="caution-headline">{{ headline() }}</p>
      <div class="caution-lines"><ng-content /></div>
      <p class="caution-codes">Follow local codes and licensed practice.</p>
    </div>
  `,
  styles: `
    :host {
      display: flex;
      gap: 12px;
      padding: 12px 16px;
      border-radius: 8px;
      border-left: 4px solid var(--rw-caution-edge);
      background: var(--rw-caution-surface);
      color: var(--mat-sys-on-surface);
      margin: 8px 0 16px;
    }
    .caution-icon { color: var(--rw-caution-edge); flex: none; }
    .caution-body { min-width: 0; }
    .caution-headline { font-weight: 600; margin: 0 0 4px; }
    .caution-lines { font: var(--mat-sys-body-medium); }
    .caution-lines ::ng-deep p { margin: 0 0 2px; }
    .caution-codes { font: var(--mat-sys-body-medium); font-style: italic; margin: 4px 0 0; }
  `,
})
export class Caution {
  readonly headline = input.required<string>();
  readonly icon = input('warning');
}
