import { DatePipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, computed, inject, signal } from '@angular/core';
import { rxResource, takeUntilDestroyed } from '@angular/core/rxjs-interop';
import { NonNullableFormBuilder, ReactiveFormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatCardModule } from '@angular/material/card';
import { MatExpansionModule } from '@angular/material/expansion';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatPaginatorModule, PageEvent } from '@angular/material/paginator';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { MatSelectModule } from '@angular/material/select';
import { MatSortModule, Sort } from '@angular/material/sort';
import { MatTableModule } from '@angular/material/table';
import { RouterLink } from '@angular/router';
import { debounceTime, distinctUntilChanged, map } from 'rxjs';
import { Caution } from '../../../shared/caution/caution';
import { FirmwareApi } from '../firmware-api';
import { sizeText } from '../firmware-format';
import { FIRMWARE_UNITS, FIRMWARE_UNIT_LABELS, FirmwareImage, FirmwareQuery, FirmwareSort, FirmwareUnit } from '../firmware.models';
import { UploadForm } from '../upload-form/upload-form';
import { StatusLabel } from '../status-label';

/** The Firmware library: upload images, and find them by model, unit, version or checksum. */
@Component({
  selector: 'rw-library-page',
  imports: [
    ReactiveFormsModule,
    RouterLink,
    DatePipe,
    Caution,
    UploadForm,
    StatusLabel,
    MatButtonModule,
    MatCardModule,
    MatExpansionModule,
    MatFormFieldModule,
    MatIconModule,
    MatInputModule,
    MatPaginatorModule,
    MatProgressBarModule,
    MatSelectModule,
    MatSortModule,
    MatTableModule,
  ],
  changeDetection: ChangeDetectionStrategy.OnPush,
  templateUrl: './library-page.html',
  styleUrl: './library-page.scss',
})
export class LibraryPage {
  private readonly api = inject(FirmwareApi);
  private readonly fb = inject(NonNullableFormBuilder);

  protected readonly columns = ['model', 'unit', 'version', 'size', 'status', 'sha256', 'createdAt', 'actions'];
  protected readonly units = FIRMWARE_UNITS;
  protected readonly unitLabels = FIRMWARE_UNIT_LABELS;
  protected readonly sizeText = sizeText;
  protected readonly search = this.fb.control('');
  protected readonly unitFilter = this.fb.control<FirmwareQuery['unit']>('');
  protected readonly statusFilter = this.fb.control<FirmwareQuery['status']>('');
  protected readonly query = signal<FirmwareQuery>({ page: 1, pageSize: 25, sort: 'createdAt', dir: 'desc', q: '', unit: '', status: '' });
  protected readonly images = rxResource({ params: () => this.query(), stream: ({ params }) => this.api.list(params) });
  protected readonly rows = computed<FirmwareImage[]>(() => (this.images.hasValue() ? this.images.value().items : []));
  protected readonly total = computed(() => (this.images.hasValue() ? this.images.value().total : 0));
  protected readonly filtered = computed(() => !!(this.query().q || this.query().unit || this.query().status));

  constructor() {
    this.search.valueChanges
      .pipe(debounceTime(300), map((q) => q.trim()), distinctUntilChanged(), takeUntilDestroyed())
      .subscribe((q) => this.query.update((query) => ({ ...query, q, page: 1 })));
    this.unitFilter.valueChanges.pipe(takeUntilDestroyed()).subscribe((unit) => this.query.update((q) => ({ ...q, unit, page: 1 })));
    this.statusFilter.valueChanges.pipe(takeUntilDestroyed()).subscribe((status) => this.query.update((q) => ({ ...q, status, page: 1 })));
  }

  protected sorted(sort: Sort): void {
    this.query.update((q) => ({
      ...q,
      page: 1,
      sort: sort.direction ? (sort.active as FirmwareSort) : 'createdAt',
      dir: sort.direction || 'desc',
    }));
  }

  protected paged(event: PageEvent): void {
    this.query.update((q) => ({ ...q, page: event.pageIndex + 1, pageSize: event.pageSize }));
  }

  protected unitLabel(unit: FirmwareUnit): string {
    return FIRMWARE_UNIT_LABELS[unit] ?? unit;
  }

  protected downloadUrl(id: number): string {
    return this.api.downloadUrl(id);
  }
}
