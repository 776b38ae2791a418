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

  private show(message: string, config: MatSnackBarConfig): void {
    this.snackBar ??= import('@angular/material/snack-bar').then((m) => this.injector.get(m.MatSnackBar));
    void this.snackBar.then((snackBar) => snackBar.open(message, 'Dismiss', config));
  }
}
