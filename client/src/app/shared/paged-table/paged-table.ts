import { BreakpointObserver } from '@angular/cdk/layout';
import { NgTemplateOutlet } from '@angular/common';
import {
  AfterContentInit,
  ChangeDetectionStrategy,
  Component,
  Directive,
  OnInit,
  TemplateRef,
  computed,
  contentChild,
  contentChildren,
  inject,
  input,
  linkedSignal,
  output,
  signal,
  viewChild,
} from '@angular/core';
import { rxResource, takeUntilDestroyed, toSignal } from '@angular/core/rxjs-interop';
import { MatButton } from '@angular/material/button';
import { MatPaginator, PageEvent } from '@angular/material/paginator';
import { MatProgressBar } from '@angular/material/progress-bar';
import { MatSort, Sort, SortDirection } from '@angular/material/sort';
import { MatColumnDef, MatTableModule, MatTable } from '@angular/material/table';
import { Page } from '@contracts/lists';
import { Observable, map } from 'rxjs';
import { readApiError } from '../../core/http/api-error';

/** What the table asks its loader for: a 1-based page, its size, and the sort the person chose. */
export interface PageRequest {
  page: number;
  pageSize: number;
  sort?: string;
  dir?: 'asc' | 'desc';
}

/** Fetches one page from the server. A new function (the page's own filters changed) starts again at page 1. */
export type PageLoader<T> = (request: PageRequest) => Observable<Page<T>>;

/** Phones get the narrow column list (and anything at most this wide). */
export const NARROW_SCREEN = '(max-width: 599.98px)';

export const PAGE_SIZES = [10, 25, 50, 100] as const;

/** What the table shows when a page comes back empty: `<ng-template rwTableEmpty>…</ng-template>`. */
@Directive({ selector: 'ng-template[rwTableEmpty]' })
export class PagedTableEmpty {
  readonly template = inject(TemplateRef);
}

/**
 * A list that the server pages and sorts, written once: MatTable + MatSort + MatPaginator, a
 * progress bar while a page loads, and an error with a retry (after the Material docs' table-http
 * example, with signals). The page declares its columns as `matColumnDef`s inside the element, with
 * `mat-sort-header` on the sortable ones; MatSort sits on this element, so set the first sort with
 * `matSortActive` / `matSortDirection` there.
 *
 *   <rw-paged-table [load]="load()" [columns]="columns" [narrowColumns]="phoneColumns"
 *                   label="Accounts" itemsLabel="accounts" matSortActive="displayName" matSortDirection="asc">
 *     <ng-container matColumnDef="displayName">…</ng-container>
 *     <ng-template rwTableEmpty>No accounts yet.</ng-template>
 *   </rw-paged-table>
 */
@Component({
  selector: 'rw-paged-table',
  imports: [MatTableModule, MatPaginator, MatProgressBar, MatButton, NgTemplateOutlet],
  hostDirectives: [{ directive: MatSort, inputs: ['matSortActive', 'matSortDirection', 'matSortDisableClear'] }],
  changeDetection: ChangeDetectionStrategy.OnPush,
  templateUrl: './paged-table.html',
  styleUrl: './paged-table.scss',
})
export class PagedTable<T> implements OnInit, AfterContentInit {
  /** Fetches a page. Pass a new function when the page's filters change. */
  readonly load = input.required<PageLoader<T>>();
  /** Column ids in order, as declared with `matColumnDef`. */
  readonly columns = input.required<readonly string[]>();
  /** Column ids on a phone (390 px wide); the wide list when not given. */
  readonly narrowColumns = input<readonly string[]>();
  /** The table's accessible name, e.g. "Accounts". */
  readonly label = input.required<string>();
  /** The rows' plural in a sentence: "Loading accounts…", "The accounts could not be loaded." */
  readonly itemsLabel = input.required<string>();
  readonly initialPageSize = input<number>(25);
  /** Rows that open something on click get the pointer and hover shade. */
  readonly clickableRows = input(false);
  readonly rowClick = output<T>();

  private readonly sort = inject(MatSort);
  private readonly table = viewChild.required<MatTable<T>>(MatTable);
  private readonly columnDefs = contentChildren(MatColumnDef);
  protected readonly empty = contentChild(PagedTableEmpty);

  protected readonly pageSizes = PAGE_SIZES;
  private readonly narrow = toSignal(inject(BreakpointObserver).observe(NARROW_SCREEN).pipe(map((s) => s.matches)), {
    initialValue: false,
  });
  protected readonly displayedColumns = computed(() => (this.narrow() && this.narrowColumns()) || this.columns());

  /** Null until MatSort has its first inputs (ngOnInit): no request goes out before the sort is known. */
  private readonly sortState = signal<{ active: string; direction: SortDirection } | null>(null);
  /** Back to the first page whenever the loader (the filters) or the sort changes; the size stays. */
  protected readonly page = linkedSignal<unknown, { index: number; size: number }>({
    source: () => [this.load(), this.sortState()],
    computation: (_, previous) => ({ index: 0, size: previous?.value.size ?? this.initialPageSize() }),
  });

  private readonly request = computed(() => {
    const sort = this.sortState();
    if (!sort) return undefined;
    const { index, size } = this.page();
    const request: PageRequest = { page: index + 1, pageSize: size };
    if (sort.active && sort.direction) {
      request.sort = sort.active;
      request.dir = sort.direction;
    }
    return { load: this.load(), request };
  });

  protected readonly data = rxResource({
    params: () => this.request(),
    stream: ({ params }) => params.load(params.request),
  });

  /** The last page stays on screen while the next one loads, so the table does not jump. */
  protected readonly rows = linkedSignal<{ items: T[] | null; failed: boolean }, T[]>({
    source: () => ({ items: this.data.hasValue() ? this.data.value().items : null, failed: !!this.data.error() }),
    computation: ({ items, failed }, previous) => items ?? (failed ? [] : (previous?.value ?? [])),
  });
  protected readonly total = linkedSignal<{ total: number | null; failed: boolean }, number>({
    source: () => ({ total: this.data.hasValue() ? this.data.value().total : null, failed: !!this.data.error() }),
    computation: ({ total, failed }, previous) => total ?? (failed ? 0 : (previous?.value ?? 0)),
  });
  protected readonly errorMessage = computed(() => {
    const error = this.data.error();
    return error ? readApiError((error as { cause?: unknown }).cause ?? error).message : '';
  });

  constructor() {
    this.sort.sortChange
      .pipe(takeUntilDestroyed())
      .subscribe((sort: Sort) => this.sortState.set({ active: sort.active, direction: sort.direction }));
  }

  ngOnInit(): void {
    this.sortState.set({ active: this.sort.active ?? '', direction: this.sort.direction });
  }

  ngAfterContentInit(): void {
    // The columns are declared by the page that uses the table (the Material docs' wrapped-table recipe).
    for (const def of this.columnDefs()) this.table().addColumnDef(def);
  }

  /** Fetches the current page again (after an edit, or when the person asks to retry). */
  reload(): void {
    this.data.reload();
  }

  protected paged(event: PageEvent): void {
    this.page.set({ index: event.pageIndex, size: event.pageSize });
  }
}
