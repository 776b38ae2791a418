import { DatePipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, computed, inject } from '@angular/core';
import { takeUntilDestroyed, toSignal } from '@angular/core/rxjs-interop';
import { NonNullableFormBuilder, ReactiveFormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatSelectModule } from '@angular/material/select';
import { MatSortModule } from '@angular/material/sort';
import { MatTableModule } from '@angular/material/table';
import { Router, RouterLink } from '@angular/router';
import { STATES } from '@domain/workflow';
import { debounceTime, distinctUntilChanged, map, merge } from 'rxjs';
import { SessionStore } from '../../../core/auth/session-store';
import { AgePipe } from '../../../shared/age';
import { equipmentKindLabel, stateLabel } from '../../../shared/labels';
import { PageLoader, PagedTable, PagedTableEmpty } from '../../../shared/paged-table/paged-table';
import { StateChip } from '../../../shared/state-chip/state-chip';
import { TicketApi } from '../ticket-api';
import { TicketRow, TicketSort, TicketState } from '../ticket.models';

/** Tickets, paged and sorted by the server. Members get their own tickets only (the server filters). */
@Component({
  selector: 'rw-ticket-list-page',
  imports: [
    ReactiveFormsModule,
    RouterLink,
    DatePipe,
    AgePipe,
    StateChip,
    PagedTable,
    PagedTableEmpty,
    MatTableModule,
    MatSortModule,
    MatFormFieldModule,
    MatInputModule,
    MatSelectModule,
    MatIconModule,
    MatButtonModule,
  ],
  changeDetection: ChangeDetectionStrategy.OnPush,
  templateUrl: './ticket-list-page.html',
  styleUrl: './ticket-list-page.scss',
})
export class TicketListPage {
  private readonly api = inject(TicketApi);
  private readonly router = inject(Router);
  protected readonly session = inject(SessionStore);

  /** A member sees only their own tickets: an Owner column would repeat their name on every row. */
  protected readonly ownOnly = computed(() => !this.session.roles().some((r) => r !== 'member'));
  protected readonly columns = computed(() =>
    this.ownOnly()
      ? ['tag', 'equipment', 'state', 'stateSince', 'createdAt']
      : ['tag', 'equipment', 'owner', 'state', 'stateSince', 'createdAt'],
  );
  /** On a phone: one cell a ticket with the tag, the lane, what it is (and whose, for staff). */
  protected readonly phoneColumns = ['summary'];
  protected readonly states = STATES;
  protected readonly stateLabel = stateLabel;
  protected readonly kindLabel = equipmentKindLabel;
  protected readonly now = Date.now();
  protected readonly title = computed(() => (this.ownOnly() ? 'My tickets' : 'Tickets'));

  protected readonly filters = inject(NonNullableFormBuilder).group({
    q: [''],
    state: ['' as TicketState | ''],
  });

  /** The filters as sent: the search once the person pauses typing, the lane at once. */
  private readonly applied = toSignal(
    merge(
      this.filters.controls.q.valueChanges.pipe(debounceTime(300)),
      this.filters.controls.state.valueChanges,
    ).pipe(
      map(() => ({ q: this.filters.controls.q.value.trim(), state: this.filters.controls.state.value })),
      distinctUntilChanged((a, b) => a.q === b.q && a.state === b.state),
      takeUntilDestroyed(),
    ),
    { initialValue: { q: '', state: '' as TicketState | '' } },
  );
  protected readonly filtered = computed(() => !!this.applied().q || !!this.applied().state);

  /** New filters make a new loader, and the table starts again at page 1. */
  protected readonly load = computed<PageLoader<TicketRow>>(() => {
    const { q, state } = this.applied();
    return ({ sort, ...page }) => this.api.list({ ...page, sort: sort as TicketSort | undefined, q, state });
  });

  protected open(row: TicketRow): void {
    void this.router.navigate(['/tickets', row.tag]);
  }

  protected clearFilters(): void {
    this.filters.setValue({ q: '', state: '' });
  }
}
