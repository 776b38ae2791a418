import { Routes } from '@angular/router';

export const TICKET_ROUTES: Routes = [
  {
    path: '',
    title: 'Tickets · Rigwright',
    loadComponent: () => import('./ticket-list-page/ticket-list-page').then((m) => m.TicketListPage),
  },
  {
    path: ':tag',
    title: 'Ticket · Rigwright',
    loadComponent: () => import('./ticket-page/ticket-page').then((m) => m.TicketPage),
  },
];
