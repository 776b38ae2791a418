import { Injectable, Injector, inject } from '@angular/core';
import type { MatSnackBar, MatSnackBarConfig } from '@angular/material/snack-bar';

/**
 * Short messages at the bottom of the screen. Errors stay longer and are announced assertively.
 *
 * The snack bar (and the CDK overlay under it) is loaded on the first message, not with the app:
 * every page needs the notifier, few page views ever show a message, and it keeps ~4 kB out of the
 * first download (angular.json budget).
 */
@Injectable({ providedIn: 'root' })
export class Notifier {
  private readonly injector = inject(Injector);
  private snackBar?: Promise<MatSnackBar>;

  info(message: string): void {
    this.show(message, { duration: 5000, politeness: 'polite' });
  }

  error(message: string): void {
    this.show(message, { duration: 10000, politeness: 'assertive', panelClass: 'rw-snack-error' });
  }

  /**
   * A message with one action (e.g. Undo) for `durationMs`. Resolves true when the person chose
   * the action, false when the message went away (timed out, dismissed, replaced by another).
   */
  async offer(message: string, action: string, durationMs: number): Promise<boolean> {
    const snackBar = await this.load();
    const ref = snackBar.open(message, action, { duration: durationMs, politeness: 'polite' });
    return new Promise<boolean>((resolve) => ref.afterDismissed().subscribe((d) => resolve(d.dismissedByAction)));
  }

  private load(): Promise<MatSnackBar> {
    this.snackBar ??= import('@angular/material/snack-bar').then((m) => this.injector.get(m.MatSnackBar));
    return this.snackBar;
  }

  private show(message: string, config: MatSnackBarConfig): void {
    void this.load().then((snackBar) => snackBar.open(message, 'Dismiss', config));
  }
}
