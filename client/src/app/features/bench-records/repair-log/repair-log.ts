import { DatePipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, computed, inject, input, output, signal } from '@angular/core';
import { rxResource } from '@angular/core/rxjs-interop';
import { NonNullableFormBuilder, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatCardModule } from '@angular/material/card';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatSortModule } from '@angular/material/sort';
import { MatTableModule } from '@angular/material/table';
import { map } from 'rxjs';
import { SessionStore } from '../../../core/auth/session-store';
import { Caution } from '../../../shared/caution/caution';
import { controlMessage } from '../../../shared/form-errors';
import { FormSubmitter } from '../../../shared/form-submit';
import { PageLoader, PagedTable, PagedTableEmpty } from '../../../shared/paged-table/paged-table';
import { TicketDetail } from '../../tickets/ticket.models';
import { BenchRecordsApi } from '../bench-records-api';
import { formatMinor, moneyValidator, toMinorUnits } from '../bench-records-forms';
import { RepairPartEntry, RepairWorkEntry } from '../bench-records.models';
import { TicketPhotos } from '../../tickets/ticket-photos/ticket-photos';

/** "95 min" → "1 h 35 min". */
export function minutesText(minutes: number): string {
  const h = Math.floor(minutes / 60);
  const m = minutes % 60;
  return h ? `${h} h${m ? ` ${m} min` : ''}` : `${m} min`;
}

/** The Repair lane's record: the cautions of the work, work done and parts used, each list paged. */
@Component({
  selector: 'rw-repair-log',
  imports: [
    ReactiveFormsModule,
    DatePipe,
    Caution,
    PagedTable,
    PagedTableEmpty,
    MatButtonModule,
    MatCardModule,
    MatFormFieldModule,
    MatIconModule,
    MatInputModule,
    MatSortModule,
    MatTableModule,
    TicketPhotos,
  ],
  changeDetection: ChangeDetectionStrategy.OnPush,
  templateUrl: './repair-log.html',
  styleUrl: './repair-log.scss',
})
export class RepairLog {
  readonly ticket = input.required<TicketDetail>();
  readonly recorded = output<void>();

  private readonly api = inject(BenchRecordsApi);
  private readonly fb = inject(NonNullableFormBuilder);
  protected readonly session = inject(SessionStore);
  protected readonly message = controlMessage;
  protected readonly minutesText = minutesText;
  protected readonly money = formatMinor;

  /** Bumped after each entry, so the lists and totals load again. */
  private readonly revision = signal(0);
  private readonly tag = computed(() => this.ticket().tag);

  protected readonly summary = rxResource({
    params: () => ({ tag: this.tag(), revision: this.revision() }),
    stream: ({ params }) => this.api.repairLog(params.tag, { kind: 'work', page: 1, pageSize: 1 }),
  });
  protected readonly canRecord = computed(() => this.session.worksTheBench() && this.summary.hasValue() && this.summary.value().canRecord);

  protected readonly workColumns = ['at', 'description', 'minutes', 'technician'];
  protected readonly workPhone = ['description', 'minutes'];
  protected readonly partColumns = ['at', 'description', 'quantity', 'unitCost', 'cost'];
  protected readonly partPhone = ['description', 'quantity', 'cost'];

  protected readonly loadWork = computed<PageLoader<RepairWorkEntry>>(() => {
    const tag = this.tag();
    this.revision();
    return (r) => this.api.repairLog(tag, { kind: 'work', page: r.page, pageSize: r.pageSize, dir: r.dir }).pipe(map((v) => v.work!));
  });
  protected readonly loadParts = computed<PageLoader<RepairPartEntry>>(() => {
    const tag = this.tag();
    this.revision();
    return (r) => this.api.repairLog(tag, { kind: 'parts', page: r.page, pageSize: r.pageSize, dir: r.dir }).pipe(map((v) => v.parts!));
  });

  protected readonly workForm = this.fb.group({
    description: ['', [Validators.required, Validators.minLength(3), Validators.maxLength(1000)]],
    minutes: [null as number | null, [Validators.required, Validators.min(1), Validators.max(1440), Validators.pattern(/^\d+$/)]],
  });
  protected readonly partForm = this.fb.group({
    description: ['', [Validators.required, Validators.minLength(2), Validators.maxLength(200)]],
    quantity: [1 as number | null, [Validators.required, Validators.min(1), Validators.max(1000), Validators.pattern(/^\d+$/)]],
    unitCost: ['', [Validators.required, moneyValidator]],
  });
  protected readonly workSubmit = new FormSubmitter(this.workForm);
  protected readonly partSubmit = new FormSubmitter(this.partForm);
  protected readonly saved = signal('');

  protected addWork(): void {
    this.workSubmit.submit(
      () => this.api.addWork(this.tag(), { description: this.workForm.controls.description.value.trim(), minutes: Number(this.workForm.controls.minutes.value) }),
      (entry) => {
        this.saved.set(`Logged ${minutesText(entry.minutes)} of work.`);
        this.workForm.reset();
        this.revision.update((n) => n + 1);
        this.recorded.emit();
      },
    );
  }

  protected addPart(): void {
    this.partSubmit.submit(
      () =>
        this.api.addPart(this.tag(), {
          description: this.partForm.controls.description.value.trim(),
          quantity: Number(this.partForm.controls.quantity.value),
          unitCostMinor: toMinorUnits(this.partForm.controls.unitCost.value) ?? -1,
        }),
      (entry) => {
        this.saved.set(`Recorded ${entry.quantity} × ${entry.description}.`);
        this.partForm.reset();
        this.revision.update((n) => n + 1);
        this.recorded.emit();
      },
    );
  }

  protected moneyMessage(): string {
    const c = this.partForm.controls.unitCost;
    if (c.errors?.['money']) return 'Give the cost per item as an amount such as 12.50.';
    return controlMessage(c, 'the cost per item');
  }
}
