import { Routes } from '@angular/router';

export const FLASHER_ROUTES: Routes = [
  {
    path: '',
    title: 'Flasher · Rigwright',
    loadComponent: () => import('./flasher-page/flasher-page').then((m) => m.FlasherPage),
  },
];
