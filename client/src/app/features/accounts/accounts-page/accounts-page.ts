import { DatePipe, NgTemplateOutlet } from '@angular/common';
import { ChangeDetectionStrategy, Component, computed, inject, signal, viewChild } from '@angular/core';
import { takeUntilDestroyed, toSignal } from '@angular/core/rxjs-interop';
import { NonNullableFormBuilder, ReactiveFormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatDialog } from '@angular/material/dialog';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatMenuModule } from '@angular/material/menu';
import { MatSortModule } from '@angular/material/sort';
import { MatTableModule } from '@angular/material/table';
import { debounceTime, distinctUntilChanged, map } from 'rxjs';
import { ROLE_LABELS } from '../../../core/auth/auth.models';
import { SessionStore } from '../../../core/auth/session-store';
import { Notifier } from '../../../core/notifier';
import { PageLoader, PagedTable, PagedTableEmpty } from '../../../shared/paged-table/paged-table';
import { AccountApi } from '../account-api';
import { AccountDialog, AccountDialogData } from '../account-dialog/account-dialog';
import { AccountSort, UserRow } from '../account.models';

/** Accounts: who may sign in, with which roles. */
@Component({
  selector: 'rw-accounts-page',
  imports: [
    ReactiveFormsModule,
    DatePipe,
    NgTemplateOutlet,
    PagedTable,
    PagedTableEmpty,
    MatTableModule,
    MatSortModule,
    MatFormFieldModule,
    MatInputModule,
    MatIconModule,
    MatButtonModule,
    MatMenuModule,
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
  private readonly table = viewChild.required<PagedTable<UserRow>>(PagedTable);

  protected readonly columns = ['displayName', 'email', 'roles', 'status', 'createdAt', 'actions'];
  protected readonly phoneColumns = ['summary', 'menu'];
  protected readonly search = inject(NonNullableFormBuilder).control('');
  /** The search as sent: trimmed, and only once the person pauses typing. */
  protected readonly searchText = toSignal(
    this.search.valueChanges.pipe(debounceTime(300), map((q) => q.trim()), distinctUntilChanged(), takeUntilDestroyed()),
    { initialValue: '' },
  );
  /** A new search makes a new loader, and the table starts again at page 1. */
  protected readonly load = computed<PageLoader<UserRow>>(() => {
    const q = this.searchText();
    return ({ sort, ...page }) => this.api.list({ ...page, sort: sort as AccountSort | undefined, q });
  });
  protected readonly busyId = signal<UserRow['id'] | null>(null);

  protected roleNames(row: UserRow): string {
    return row.roles.map((r) => ROLE_LABELS[r] ?? r).join(', ');
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
        this.table().reload();
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
        this.table().reload();
      },
      error: () => this.busyId.set(null),
    });
  }
}
