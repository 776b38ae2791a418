import { Routes } from '@angular/router';
import { homeRedirect, roleGuard, signedInGuard, signedOutGuard } from './core/auth/guards';

export const routes: Routes = [
  { path: '', pathMatch: 'full', redirectTo: homeRedirect },
  {
    path: 'sign-in',
    title: 'Sign in · Rigwright',
    canActivate: [signedOutGuard],
    loadComponent: () => import('./features/auth/sign-in-page/sign-in-page').then((m) => m.SignInPage),
  },
  {
    path: 'register',
    title: 'Register as a member · Rigwright',
    canActivate: [signedOutGuard],
    loadComponent: () => import('./features/auth/register-page/register-page').then((m) => m.RegisterPage),
  },
  {
    path: 'forgot-password',
    title: 'Forgot password · Rigwright',
    loadComponent: () =>
      import('./features/auth/forgot-password-page/forgot-password-page').then((m) => m.ForgotPasswordPage),
  },
  {
    path: 'reset-password',
    title: 'Choose a new password · Rigwright',
    loadComponent: () =>
      import('./features/auth/reset-password-page/reset-password-page').then((m) => m.ResetPasswordPage),
  },
  {
    path: 'account/password',
    title: 'Change password · Rigwright',
    canActivate: [signedInGuard],
    loadComponent: () =>
      import('./features/auth/change-password-page/change-password-page').then((m) => m.ChangePasswordPage),
  },
  {
    path: 'hand-in',
    title: 'Hand in equipment · Rigwright',
    canActivate: [roleGuard('member', 'technician', 'admin')],
    loadComponent: () => import('./features/tickets/intake-page/intake-page').then((m) => m.IntakePage),
  },
  {
    path: 'tickets',
    canActivate: [signedInGuard],
    loadChildren: () => import('./features/tickets/tickets.routes').then((m) => m.TICKET_ROUTES),
  },
  {
    path: 'board',
    title: 'Bench board · Rigwright',
    canActivate: [roleGuard('technician', 'admin')],
    loadChildren: () => import('./features/board/board.routes').then((m) => m.BOARD_ROUTES),
  },
  {
    path: 'firmware',
    canActivate: [roleGuard('technician', 'admin')],
    loadChildren: () => import('./features/firmware/firmware.routes').then((m) => m.FIRMWARE_ROUTES),
  },
  {
    path: 'flasher',
    canActivate: [roleGuard('technician', 'admin')],
    loadChildren: () => import('./features/flasher/flasher.routes').then((m) => m.FLASHER_ROUTES),
  },
  {
    path: 'admin/accounts',
    title: 'Accounts · Rigwright',
    canActivate: [roleGuard('admin')],
    loadChildren: () => import('./features/accounts/accounts.routes').then((m) => m.ACCOUNT_ROUTES),
  },
  {
    path: 'bookings',
    canActivate: [signedInGuard],
    loadChildren: () => import('./features/bookings/bookings.routes').then((m) => m.BOOKING_ROUTES),
  },
  {
    path: 'tonight',
    title: 'Tonight at the bench · Rigwright',
    canActivate: [roleGuard('technician', 'admin')],
    loadComponent: () => import('./features/bookings/tonight-page/tonight-page').then((m) => m.TonightPage),
  },
  {
    path: 'admin/benches',
    canActivate: [roleGuard('admin')],
    loadChildren: () => import('./features/benches/benches.routes').then((m) => m.BENCH_ROUTES),
  },
  {
    path: 'admin/test-limits',
    title: 'Test limits · Rigwright',
    canActivate: [roleGuard('admin')],
    loadComponent: () => import('./features/bench-records/test-limits-page/test-limits-page').then((m) => m.TestLimitsPage),
  },
  {
    path: 'treasurer',
    canActivate: [roleGuard('treasurer')],
    loadChildren: () => import('./features/payments/treasurer.routes').then((m) => m.TREASURER_ROUTES),
  },
  {
    path: 'calculators',
    title: 'Bench calculators · Rigwright',
    canActivate: [signedInGuard],
    loadChildren: () => import('./features/calculators/calculators.routes').then((m) => m.CALCULATOR_ROUTES),
  },
  {
    // The owner's pages behind an e-mailed link: no account, the token is the key.
    path: 'owner/status/:tag/:token',
    title: 'Your ticket · Rigwright',
    loadComponent: () => import('./features/owner-records/owner-status-page/owner-status-page').then((m) => m.OwnerStatusPage),
  },
  {
    path: 'owner/approve/:tag/:token',
    title: 'Approve a quote · Rigwright',
    loadComponent: () => import('./features/owner-records/owner-approval-page/owner-approval-page').then((m) => m.OwnerApprovalPage),
  },
  {
    path: '**',
    title: 'Not found · Rigwright',
    loadComponent: () => import('./core/not-found-page/not-found-page').then((m) => m.NotFoundPage),
  },
];
