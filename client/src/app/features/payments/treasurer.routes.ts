import { Routes } from '@angular/router';

/** The treasurer's screens (lazy: the chart package loads only here). */
export const TREASURER_ROUTES: Routes = [
  { path: '', pathMatch: 'full', redirectTo: 'month' },
  {
    path: 'month',
    title: 'Reconciliation · Rigwright',
    loadComponent: () => import('./reconciliation-page/reconciliation-page').then((m) => m.ReconciliationPage),
  },
  {
    path: 'fees',
    title: 'Fee schedule · Rigwright',
    loadComponent: () => import('./fee-schedule-page/fee-schedule-page').then((m) => m.FeeSchedulePage),
  },
];
