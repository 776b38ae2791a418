import { BreakpointObserver } from '@angular/cdk/layout';
import { ChangeDetectionStrategy, Component, computed, inject, signal } from '@angular/core';
import { toSignal } from '@angular/core/rxjs-interop';
import { MatButton, MatIconButton } from '@angular/material/button';
import { MatIcon } from '@angular/material/icon';
import { MatMenu, MatMenuItem, MatMenuTrigger } from '@angular/material/menu';
import { MatSidenav, MatSidenavContainer, MatSidenavContent } from '@angular/material/sidenav';
import { MatToolbar } from '@angular/material/toolbar';
import { Router, RouterLink, RouterLinkActive, RouterOutlet } from '@angular/router';
import { map } from 'rxjs';
import { AuthApi } from '../auth/auth-api';
import { Role } from '../auth/auth.models';
import { SessionStore } from '../auth/session-store';

interface NavItem {
  path: string;
  label: string;
  icon: string;
  /** Any of these roles sees the item; empty means any signed-in person. */
  roles: Role[];
}

/** Everything in the navigation, in order. Only what the person's roles allow is shown. */
export const NAV_ITEMS: readonly NavItem[] = [
  { path: '/board', label: 'Bench board', icon: 'view_kanban', roles: ['technician', 'admin'] },
  { path: '/tickets', label: 'Tickets', icon: 'confirmation_number', roles: [] },
  { path: '/hand-in', label: 'Hand in equipment', icon: 'move_to_inbox', roles: ['member', 'technician', 'admin'] },
  { path: '/tonight', label: 'Tonight at the bench', icon: 'nights_stay', roles: ['technician', 'admin'] },
  { path: '/bookings', label: 'Bench slots', icon: 'event_available', roles: [] },
  { path: '/firmware', label: 'Firmware library', icon: 'memory', roles: ['technician', 'admin'] },
  { path: '/flasher', label: 'Flasher', icon: 'developer_board', roles: ['technician', 'admin'] },
  { path: '/treasurer/month', label: 'Reconciliation', icon: 'account_balance', roles: ['treasurer'] },
  { path: '/treasurer/fees', label: 'Fee schedule', icon: 'sell', roles: ['treasurer'] },
  { path: '/calculators', label: 'Bench calculators', icon: 'calculate', roles: [] },
  { path: '/admin/accounts', label: 'Accounts', icon: 'manage_accounts', roles: ['admin'] },
  { path: '/admin/benches', label: 'Benches and sessions', icon: 'table_restaurant', roles: ['admin'] },
  { path: '/admin/test-limits', label: 'Test limits', icon: 'rule', roles: ['admin'] },
];

/** The app's frame: a toolbar, and a side navigation once someone is signed in. */
@Component({
  selector: 'rw-shell',
  imports: [
    RouterOutlet,
    RouterLink,
    RouterLinkActive,
    // The navigation is plain links, not mat-nav-list: @angular/material/list also carries the
    // selection list and with it all of @angular/forms, ~15 kB of the first download.
    MatToolbar,
    MatSidenav,
    MatSidenavContainer,
    MatSidenavContent,
    MatIcon,
    MatButton,
    MatIconButton,
    MatMenu,
    MatMenuItem,
    MatMenuTrigger,
  ],
  changeDetection: ChangeDetectionStrategy.OnPush,
  templateUrl: './shell.html',
  styleUrl: './shell.scss',
})
export class Shell {
  protected readonly session = inject(SessionStore);
  private readonly authApi = inject(AuthApi);
  private readonly router = inject(Router);

  protected readonly wide = toSignal(
    inject(BreakpointObserver).observe('(min-width: 960px)').pipe(map((s) => s.matches)),
    { initialValue: true },
  );
  /** On narrow screens the navigation slides over the page and is closed by default. */
  protected readonly navOpenNarrow = signal(false);

  protected readonly navItems = computed(() => {
    const roles = this.session.roles();
    const memberOnly = !roles.some((r) => r !== 'member');
    return NAV_ITEMS.filter((item) => item.roles.length === 0 || item.roles.some((r) => roles.includes(r))).map(
      (item) => (item.path === '/tickets' && memberOnly ? { ...item, label: 'My tickets' } : item),
    );
  });

  protected readonly who = computed(() => {
    const user = this.session.user();
    if (!user) return '';
    return user.callSign ? `${user.displayName} (${user.callSign})` : user.displayName;
  });

  protected navigated(): void {
    if (!this.wide()) this.navOpenNarrow.set(false);
  }

  protected signOut(): void {
    this.authApi.signOut().subscribe({
      next: () => this.afterSignOut(),
      error: () => this.afterSignOut(),
    });
  }

  private afterSignOut(): void {
    this.session.clear();
    void this.router.navigate(['/sign-in']);
  }
}
