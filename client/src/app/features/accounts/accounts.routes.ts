import { Routes } from '@angular/router';

export const ACCOUNT_ROUTES: Routes = [
  {
    path: '',
    loadComponent: () => import('./accounts-page/accounts-page').then((m) => m.AccountsPage),
  },
];
