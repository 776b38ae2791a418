import { Routes } from '@angular/router';

export const BOARD_ROUTES: Routes = [
  {
    path: '',
    loadComponent: () => import('./board-page/board-page').then((m) => m.BoardPage),
  },
];
