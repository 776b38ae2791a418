import { Routes } from '@angular/router';

export const FIRMWARE_ROUTES: Routes = [
  {
    path: '',
    title: 'Firmware library · Rigwright',
    loadComponent: () => import('./library-page/library-page').then((m) => m.LibraryPage),
  },
  {
    path: ':id',
    title: 'Firmware image · Rigwright',
    loadComponent: () => import('./image-page/image-page').then((m) => m.ImagePage),
  },
];
