import { BreakpointObserver, BreakpointState } from '@angular/cdk/layout';
import { HarnessLoader } from '@angular/cdk/testing';
import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { HttpErrorResponse } from '@angular/common/http';
import { Component, signal, viewChild } from '@angular/core';
import { ComponentFixture, TestBed } from '@angular/core/testing';
import { MatButtonHarness } from '@angular/material/button/testing';
import { MatPaginatorHarness } from '@angular/material/paginator/testing';
import { MatProgressBarHarness } from '@angular/material/progress-bar/testing';
import { MatSortHarness } from '@angular/material/sort/testing';
import { MatSortModule } from '@angular/material/sort';
import { MatTableHarness } from '@angular/material/table/testing';
import { MatTableModule } from '@angular/material/table';
import { Page } from '@contracts/lists';
import { BehaviorSubject, Observable, Subject, of } from 'rxjs';
import { PageLoader, PageRequest, PagedTable, PagedTableEmpty } from './paged-table';

interface Radio {
  tag: string;
  model: string;
}

/** 60 radios on the "server"; the fake loader pages and sorts them like the API does. */
const RADIOS: Radio[] = Array.from({ length: 60 }, (_, i) => ({
  tag: `RW-${String(i + 1).padStart(4, '0')}`,
  model: `Fenwick Heron ${100 + ((i * 7) % 60)}`,
}));

function serve(request: PageRequest, filter = ''): Page<Radio> {
  const key = (request.sort ?? 'tag') as keyof Radio;
  const sorted = RADIOS.filter((r) => r.model.includes(filter)).sort(
    (a, b) => a[key].localeCompare(b[key]) * (request.dir === 'desc' ? -1 : 1),
  );
  const start = (request.page - 1) * request.pageSize;
  return { items: sorted.slice(start, start + request.pageSize), total: sorted.length, page: request.page, pageSize: request.pageSize };
}

@Component({
  imports: [PagedTable, PagedTableEmpty, MatTableModule, MatSortModule],
  template: `
    <rw-paged-table
      [load]="load()"
      [columns]="['tag', 'model']"
      [narrowColumns]="['tag']"
      label="Radios"
      itemsLabel="radios"
      matSortActive="tag"
      matSortDirection="asc"
      matSortDisableClear
      [clickableRows]="true"
      (rowClick)="clicked.set($event)"
    >
      <ng-container matColumnDef="tag">
        <th mat-header-cell *matHeaderCellDef mat-sort-header>Tag</th>
        <td mat-cell *matCellDef="let row">{{ row.tag }}</td>
      </ng-container>
      <ng-container matColumnDef="model">
        <th mat-header-cell *matHeaderCellDef mat-sort-header>Make and model</th>
        <td mat-cell *matCellDef="let row">{{ row.model }}</td>
      </ng-container>
      <ng-template rwTableEmpty><span class="custom-empty">No radios on the bench.</span></ng-template>
    </rw-paged-table>
  `,
})
class Host {
  readonly requests: PageRequest[] = [];
  readonly clicked = signal<Radio | null>(null);
  /** The page's filter; a new loader is made when it changes, as the Accounts and Tickets pages do. */
  readonly filter = signal('');
  respond: (request: PageRequest, filter: string) => Observable<Page<Radio>> = (request, filter) => of(serve(request, filter));
  readonly load = signal<PageLoader<Radio>>(this.loaderFor(''));
  readonly table = viewChild.required(PagedTable);

  loaderFor(filter: string): PageLoader<Radio> {
    return (request) => {
      this.requests.push(request);
      return this.respond(request, filter);
    };
  }

  setFilter(filter: string): void {
    this.load.set(this.loaderFor(filter));
  }
}

// Harness steps each wait for the table to settle; on a loaded 2-core machine that can pass 5 s.
describe('PagedTable', { timeout: 30_000 }, () => {
  let fixture: ComponentFixture<Host>;
  let host: Host;
  let loader: HarnessLoader;
  const narrow = new BehaviorSubject<BreakpointState>({ matches: false, breakpoints: {} });

  async function setup(prepare?: (host: Host) => void) {
    TestBed.configureTestingModule({
      providers: [{ provide: BreakpointObserver, useValue: { observe: () => narrow } }],
    });
    fixture = TestBed.createComponent(Host);
    host = fixture.componentInstance;
    prepare?.(host);
    loader = TestbedHarnessEnvironment.loader(fixture);
    await fixture.whenStable();
  }

  const table = () => loader.getHarness(MatTableHarness);
  const tags = async () => (await (await table()).getCellTextByColumnName())['tag'].text;

  beforeEach(() => narrow.next({ matches: false, breakpoints: {} }));

  it('asks the server for the first page in the initial sort and shows its rows', async () => {
    await setup();
    expect(host.requests).toEqual([{ page: 1, pageSize: 25, sort: 'tag', dir: 'asc' }]);
    const t = await table();
    expect(await (await t.host()).getAttribute('aria-label')).toBe('Radios');
    expect((await t.getRows()).length).toBe(25);
    expect(await (await t.getHeaderRows())[0].getCellTextByIndex()).toEqual(['Tag', 'Make and model']);
    expect((await tags()).slice(0, 2)).toEqual(['RW-0001', 'RW-0002']);
    const paginator = await loader.getHarness(MatPaginatorHarness);
    expect(await paginator.getRangeLabel()).toBe('1 – 25 of 60');
  });

  it('sorts on the server: a header click asks for that column and starts again at page 1', async () => {
    await setup();
    const paginator = await loader.getHarness(MatPaginatorHarness);
    await paginator.goToNextPage();
    expect(host.requests.at(-1)).toEqual({ page: 2, pageSize: 25, sort: 'tag', dir: 'asc' });

    const sort = await loader.getHarness(MatSortHarness);
    const [, model] = await sort.getSortHeaders();
    await model.click();
    expect(host.requests.at(-1)).toEqual({ page: 1, pageSize: 25, sort: 'model', dir: 'asc' });
    expect(await model.getSortDirection()).toBe('asc');
    expect(await (await sort.getActiveHeader())?.getLabel()).toBe('Make and model');
    expect((await tags())[0]).toBe(serve({ page: 1, pageSize: 25, sort: 'model', dir: 'asc' }).items[0].tag);

    await model.click();
    expect(host.requests.at(-1)).toEqual({ page: 1, pageSize: 25, sort: 'model', dir: 'desc' });
    expect(await paginator.getRangeLabel()).toBe('1 – 25 of 60');
  });

  it('pages on the server: next, last, and a new page size', async () => {
    await setup();
    const paginator = await loader.getHarness(MatPaginatorHarness);
    await paginator.goToLastPage();
    expect(host.requests.at(-1)).toEqual({ page: 3, pageSize: 25, sort: 'tag', dir: 'asc' });
    expect(await tags()).toEqual(RADIOS.slice(50).map((r) => r.tag));
    expect(await paginator.getRangeLabel()).toBe('51 – 60 of 60');

    await paginator.setPageSize(50);
    expect(host.requests.at(-1)).toMatchObject({ pageSize: 50 });
    expect(await paginator.getPageSize()).toBe(50);
  });

  it('goes back to page 1 when the page passes a new loader (its filters changed)', async () => {
    await setup();
    const paginator = await loader.getHarness(MatPaginatorHarness);
    await paginator.goToNextPage();
    host.setFilter('Heron 10');
    await fixture.whenStable();
    expect(host.requests.at(-1)).toEqual({ page: 1, pageSize: 25, sort: 'tag', dir: 'asc' });
    // Heron 100..109: ten of the sixty.
    expect(await paginator.getRangeLabel()).toBe('1 – 10 of 10');
  });

  it('shows a progress bar while a page loads and keeps the last rows on screen', async () => {
    await setup();
    const pending = new Subject<Page<Radio>>();
    host.respond = () => pending;
    // Harnesses wait for the app to settle, which it does not while a page is on its way: click by hand.
    const root: HTMLElement = fixture.nativeElement;
    root.querySelector<HTMLButtonElement>('.mat-mdc-paginator-navigation-next')!.click();
    fixture.detectChanges();
    expect(host.requests.at(-1)).toEqual({ page: 2, pageSize: 25, sort: 'tag', dir: 'asc' });
    expect(root.querySelector('mat-progress-bar')?.getAttribute('aria-label')).toBe('Loading radios');
    expect(root.querySelector('table')?.getAttribute('aria-busy')).toBe('true');
    expect(root.querySelector('td.mat-column-tag')?.textContent).toBe('RW-0001');

    pending.next(serve({ page: 2, pageSize: 25, sort: 'tag', dir: 'asc' }));
    pending.complete();
    await fixture.whenStable();
    expect(await loader.getAllHarnesses(MatProgressBarHarness)).toHaveLength(0);
    expect((await tags())[0]).toBe('RW-0026');
  });

  it('says when the list could not be loaded, and Try again asks the server again', async () => {
    await setup((h) => {
      h.respond = () =>
        new Observable((sub) =>
          sub.error(new HttpErrorResponse({ status: 503, error: { error: { code: 'unavailable', message: 'The database is away. Try again in a minute.' } } })),
        );
    });
    const alert: HTMLElement = fixture.nativeElement.querySelector('[role="alert"]');
    expect(alert.textContent).toContain('The radios could not be loaded.');
    expect(alert.textContent).toContain('The database is away. Try again in a minute.');
    expect(await (await table()).getRows()).toHaveLength(0);

    host.respond = (request, filter) => of(serve(request, filter));
    const retry = await loader.getHarness(MatButtonHarness.with({ text: 'Try again' }));
    const before = host.requests.length;
    await retry.click();
    expect(host.requests.length).toBe(before + 1);
    expect(fixture.nativeElement.querySelector('[role="alert"]')).toBeNull();
    expect(await (await table()).getRows()).toHaveLength(25);
  });

  it("shows the page's own empty state when nothing comes back", async () => {
    await setup((h) => h.setFilter('no such radio'));
    expect(await (await table()).getRows()).toHaveLength(0);
    expect(fixture.nativeElement.querySelector('.custom-empty')?.textContent).toBe('No radios on the bench.');
  });

  it('shows the narrow columns on a phone', async () => {
    await setup();
    narrow.next({ matches: true, breakpoints: {} });
    await fixture.whenStable();
    expect(await (await (await table()).getHeaderRows())[0].getCellTextByIndex()).toEqual(['Tag']);
    narrow.next({ matches: false, breakpoints: {} });
    await fixture.whenStable();
    expect(await (await (await table()).getHeaderRows())[0].getCellTextByIndex()).toEqual(['Tag', 'Make and model']);
  });

  it('reports a row click, and reload() asks for the same page again', async () => {
    await setup();
    const [first] = await (await table()).getRows();
    await (await first.host()).click();
    expect(host.clicked()?.tag).toBe('RW-0001');
    const before = host.requests.length;
    host.table().reload();
    await fixture.whenStable();
    expect(host.requests.slice(before)).toEqual([{ page: 1, pageSize: 25, sort: 'tag', dir: 'asc' }]);
  });
});
