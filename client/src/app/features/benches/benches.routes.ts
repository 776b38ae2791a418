import { Routes } from '@angular/router';

export const BENCH_ROUTES: Routes = [
  {
    path: '',
    title: 'Benches and sessions · Rigwright',
    loadComponent: () => import('./benches-page/benches-page').then((m) => m.BenchesPage),
  },
];
