import { Routes } from '@angular/router';
import { roleGuard } from '../../core/auth/guards';

export const BOOKING_ROUTES: Routes = [
  {
    path: '',
    title: 'My bench slots · Rigwright',
    loadComponent: () => import('./my-bookings-page/my-bookings-page').then((m) => m.MyBookingsPage),
  },
  {
    path: 'book',
    title: 'Book a bench slot · Rigwright',
    canActivate: [roleGuard('member', 'technician', 'admin')],
    loadComponent: () => import('./book-slot-page/book-slot-page').then((m) => m.BookSlotPage),
  },
];
