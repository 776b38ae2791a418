import { DatePipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, computed, inject, signal } from '@angular/core';
import { rxResource, takeUntilDestroyed } from '@angular/core/rxjs-interop';
import { NonNullableFormBuilder, ReactiveFormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatDialog } from '@angular/material/dialog';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatPaginatorModule, PageEvent } from '@angular/material/paginator';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { MatSortModule, Sort } from '@angular/material/sort';
import { MatTableModule } from '@angular/material/table';
import { debounceTime, distinctUntilChanged, map } from 'rxjs';
import { ROLE_LABELS } from '../../../core/auth/auth.models';
import { SessionStore } from '../../../core/auth/session-store';
import { Notifier } from '../../../core/notifier';
import { AccountApi } from '../account-api';
import { AccountDialog, AccountDialogData } from '../account-dialog/account-dialog';
import { AccountQuery, AccountSort, UserRow } from '../account.models';

/** Accounts: who may sign in, with which roles. */
@Component({
  selector: 'rw-accounts-page',
  imports: [
    ReactiveFormsModule,
    DatePipe,
    MatTableModule,
    MatSortModule,
    MatPaginatorModule,
    MatFormFieldModule,
    MatInputModule,
    MatIconModule,
    MatButtonModule,
    MatProgressBarModule,
  ],
  changeDetection: ChangeDetectionStrategy.OnPush,
  templateUrl: './accounts-page.html',
  styleUrl: './accounts-page.scss',
})
export class AccountsPage {
  private readonly api = inject(AccountApi);
  private readonly dialog = inject(MatDialog);
  private readonly notifier = inject(Notifier);
  protected readonly session = inject(SessionStore);

  protected readonly columns = ['displayName', 'email', 'callSign', 'roles', 'status', 'createdAt', 'actions'];
  protected readonly search = inject(NonNullableFormBuilder).control('');
  protected readonly query = signal<AccountQuery>({ page: 1, pageSize: 25, sort: 'displayName', dir: 'asc', q: '' });
  protected readonly accounts = rxResource({
    params: () => this.query(),
    stream: ({ params }) => this.api.list(params),
  });
  protected readonly rows = computed<UserRow[]>(() => (this.accounts.hasValue() ? this.accounts.value().items : []));
  protected readonly total = computed(() => (this.accounts.hasValue() ? this.accounts.value().total : 0));
  protected readonly busyId = signal<UserRow['id'] | null>(null);

  constructor() {
    this.search.valueChanges
      .pipe(debounceTime(300), map((q) => q.trim()), distinctUntilChanged(), takeUntilDestroyed())
      .subscribe((q) => this.query.update((query) => ({ ...query, q, page: 1 })));
  }

  protected roleNames(row: UserRow): string {
    return row.roles.map((r) => ROLE_LABELS[r] ?? r).join(', ');
  }

  protected sorted(sort: Sort): void {
    this.query.update((q) => ({
      ...q,
      page: 1,
      sort: sort.direction ? (sort.active as AccountSort) : 'displayName',
      dir: sort.direction || 'asc',
    }));
  }

  protected paged(event: PageEvent): void {
    this.query.update((q) => ({ ...q, page: event.pageIndex + 1, pageSize: event.pageSize }));
  }

  protected create(): void {
    this.openDialog({ account: null }, (row) => this.notifier.info(`Account for ${row.displayName} created.`));
  }

  protected edit(row: UserRow): void {
    this.openDialog({ account: row }, (saved) => this.notifier.info(`${saved.displayName} saved.`));
  }

  private openDialog(data: AccountDialogData, done: (row: UserRow) => void): void {
    this.dialog
      .open<AccountDialog, AccountDialogData, UserRow>(AccountDialog, { data, autoFocus: 'first-tabbable' })
      .afterClosed()
      .subscribe((row) => {
        if (!row) return;
        done(row);
        this.accounts.reload();
      });
  }

  protected isMe(row: UserRow): boolean {
    return String(row.id) === String(this.session.user()?.id);
  }

  protected toggleDisabled(row: UserRow): void {
    this.busyId.set(row.id);
    this.api.update(row.id, { disabled: !row.disabled }).subscribe({
      next: (saved) => {
        this.busyId.set(null);
        this.notifier.info(saved.disabled ? `${saved.displayName} can no longer sign in.` : `${saved.displayName} can sign in again.`);
        this.accounts.reload();
      },
      error: () => this.busyId.set(null),
    });
  }
}
