import { Routes } from '@angular/router';

export const CALCULATOR_ROUTES: Routes = [
  {
    path: '',
    title: 'Bench calculators · Rigwright',
    loadComponent: () => import('./calculators-page/calculators-page').then((m) => m.CalculatorsPage),
  },
];
