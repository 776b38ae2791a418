import { DatePipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, computed, inject, signal } from '@angular/core';
import { rxResource, takeUntilDestroyed } from '@angular/core/rxjs-interop';
import { NonNullableFormBuilder, ReactiveFormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatPaginatorModule, PageEvent } from '@angular/material/paginator';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { MatSelectModule } from '@angular/material/select';
import { MatSortModule, Sort } from '@angular/material/sort';
import { MatTableModule } from '@angular/material/table';
import { Router, RouterLink } from '@angular/router';
import { STATES } from '@domain/workflow';
import { debounceTime, distinctUntilChanged, map } from 'rxjs';
import { SessionStore } from '../../../core/auth/session-store';
import { AgePipe } from '../../../shared/age';
import { equipmentKindLabel, stateLabel } from '../../../shared/labels';
import { StateChip } from '../../../shared/state-chip/state-chip';
import { TicketApi } from '../ticket-api';
import { TicketQuery, TicketRow, TicketSort, TicketState } from '../ticket.models';

/** Tickets, paged and sorted by the server. Members get their own tickets only (the server filters). */
@Component({
  selector: 'rw-ticket-list-page',
  imports: [
    ReactiveFormsModule,
    RouterLink,
    DatePipe,
    AgePipe,
    StateChip,
    MatTableModule,
    MatSortModule,
    MatPaginatorModule,
    MatFormFieldModule,
    MatInputModule,
    MatSelectModule,
    MatIconModule,
    MatButtonModule,
    MatProgressBarModule,
  ],
  changeDetection: ChangeDetectionStrategy.OnPush,
  templateUrl: './ticket-list-page.html',
  styleUrl: './ticket-list-page.scss',
})
export class TicketListPage {
  private readonly api = inject(TicketApi);
  private readonly router = inject(Router);
  protected readonly session = inject(SessionStore);

  protected readonly columns = ['tag', 'equipment', 'owner', 'state', 'stateSince', 'createdAt'];
  protected readonly states = STATES;
  protected readonly stateLabel = stateLabel;
  protected readonly kindLabel = equipmentKindLabel;
  protected readonly now = Date.now();

  protected readonly filters = inject(NonNullableFormBuilder).group({
    q: [''],
    state: ['' as TicketState | ''],
  });

  protected readonly query = signal<TicketQuery>({ page: 1, pageSize: 25, sort: 'createdAt', dir: 'desc', q: '', state: '' });

  protected readonly tickets = rxResource({
    params: () => this.query(),
    stream: ({ params }) => this.api.list(params),
  });

  protected readonly rows = computed<TicketRow[]>(() => (this.tickets.hasValue() ? this.tickets.value().items : []));
  protected readonly total = computed(() => (this.tickets.hasValue() ? this.tickets.value().total : 0));
  protected readonly filtered = computed(() => !!this.query().q || !!this.query().state);
  protected readonly title = computed(() => (this.session.roles().some((r) => r !== 'member') ? 'Tickets' : 'My tickets'));

  constructor() {
    // Search as the person types, but not on every key; a new search starts at page 1.
    this.filters.controls.q.valueChanges
      .pipe(debounceTime(300), map((q) => q.trim()), distinctUntilChanged(), takeUntilDestroyed())
      .subscribe((q) => this.query.update((query) => ({ ...query, q, page: 1 })));
    this.filters.controls.state.valueChanges
      .pipe(takeUntilDestroyed())
      .subscribe((state) => this.query.update((query) => ({ ...query, state, page: 1 })));
  }

  protected sorted(sort: Sort): void {
    this.query.update((q) => ({
      ...q,
      page: 1,
      sort: sort.direction ? (sort.active as TicketSort) : 'createdAt',
      dir: sort.direction || 'desc',
    }));
  }

  protected paged(event: PageEvent): void {
    this.query.update((q) => ({ ...q, page: event.pageIndex + 1, pageSize: event.pageSize }));
  }

  protected open(row: TicketRow): void {
    void this.router.navigate(['/tickets', row.tag]);
  }

  protected clearFilters(): void {
    this.filters.setValue({ q: '', state: '' });
  }
}
