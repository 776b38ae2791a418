import { Clipboard } from '@angular/cdk/clipboard';
import { ChangeDetectionStrategy, Component, computed, inject, signal } from '@angular/core';
import { rxResource, toSignal } from '@angular/core/rxjs-interop';
import { FormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatButtonToggleModule } from '@angular/material/button-toggle';
import { MatIconModule } from '@angular/material/icon';
import { MatPaginatorModule, PageEvent } from '@angular/material/paginator';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { MatSortModule, Sort } from '@angular/material/sort';
import { MatTableModule } from '@angular/material/table';
import { RouterLink } from '@angular/router';
import { SessionStore } from '../../../core/auth/session-store';
import { Notifier } from '../../../core/notifier';
import { BookingApi } from '../booking-api';
import { BOOKING_PURPOSE_LABELS, BookingQuery, BookingRow, BookingSort, BookingWhen, CalendarFeedLink } from '../booking.models';
import { clubSpan } from '../club-time';

/** "My bench slots": the person's bookings, paged and sorted by the server, and their calendar feed. */
@Component({
  selector: 'rw-my-bookings-page',
  imports: [
    FormsModule,
    RouterLink,
    MatTableModule,
    MatSortModule,
    MatPaginatorModule,
    MatButtonModule,
    MatButtonToggleModule,
    MatIconModule,
    MatProgressBarModule,
  ],
  changeDetection: ChangeDetectionStrategy.OnPush,
  templateUrl: './my-bookings-page.html',
  styleUrl: './my-bookings-page.scss',
})
export class MyBookingsPage {
  private readonly api = inject(BookingApi);
  private readonly notifier = inject(Notifier);
  private readonly clipboard = inject(Clipboard);
  protected readonly session = inject(SessionStore);

  protected readonly columns = ['startsAt', 'bench', 'purpose', 'ticket', 'status', 'actions'];
  protected readonly settings = toSignal(this.api.settings());
  protected readonly zone = computed(() => this.settings()?.timeZone ?? 'Europe/London');

  protected readonly query = signal<BookingQuery>({ page: 1, pageSize: 25, sort: 'startsAt', dir: 'asc', when: 'upcoming' });
  protected readonly bookings = rxResource({ params: () => this.query(), stream: ({ params }) => this.api.mine(params) });
  protected readonly rows = computed<BookingRow[]>(() => (this.bookings.hasValue() ? this.bookings.value().items : []));
  protected readonly total = computed(() => (this.bookings.hasValue() ? this.bookings.value().total : 0));
  protected readonly busyId = signal<number | null>(null);

  protected readonly feed = signal<CalendarFeedLink | null>(null);
  protected readonly feedBusy = signal(false);

  constructor() {
    this.api.feed().subscribe((f) => this.feed.set(f));
  }

  protected purposeLabel(row: BookingRow): string {
    return BOOKING_PURPOSE_LABELS[row.purpose];
  }

  protected span(row: BookingRow): string {
    return clubSpan(row.startsAt, row.endsAt, this.zone());
  }

  protected when(when: BookingWhen): void {
    this.query.update((q) => ({ ...q, when, page: 1, dir: when === 'upcoming' ? 'asc' : 'desc' }));
  }

  protected sorted(sort: Sort): void {
    this.query.update((q) => ({ ...q, page: 1, sort: sort.direction ? (sort.active as BookingSort) : 'startsAt', dir: sort.direction || 'asc' }));
  }

  protected paged(event: PageEvent): void {
    this.query.update((q) => ({ ...q, page: event.pageIndex + 1, pageSize: event.pageSize }));
  }

  protected cancel(row: BookingRow): void {
    this.busyId.set(row.id);
    this.api.cancel(row.id).subscribe({
      next: (r) => {
        this.busyId.set(null);
        this.notifier.info(`Cancelled: ${r.benchName}, ${this.span(r)}.`);
        this.bookings.reload();
      },
      error: () => this.busyId.set(null),
    });
  }

  protected copy(url: string): void {
    this.notifier.info(this.clipboard.copy(url) ? 'Calendar link copied.' : 'Select the link and copy it by hand.');
  }

  protected resetFeed(): void {
    this.feedBusy.set(true);
    this.api.resetFeed().subscribe({
      next: (f) => {
        this.feedBusy.set(false);
        this.feed.set(f);
        this.notifier.info('New calendar link made. Any older link has stopped working.');
      },
      error: () => this.feedBusy.set(false),
    });
  }
}
