import { DatePipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, computed, inject, signal } from '@angular/core';
import { rxResource } from '@angular/core/rxjs-interop';
import { FormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatCardModule } from '@angular/material/card';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { RouterLink } from '@angular/router';
import { readApiError } from '../../../core/http/api-error';
import { formatMoney, METHOD_LABELS } from '../money-format';
import { PaymentsApi } from '../payments-api';
import { IncomeChart } from './income-chart';

function thisMonth(): string {
  const d = new Date();
  return `${d.getFullYear()}-${String(d.getMonth() + 1).padStart(2, '0')}`;
}

/** The treasurer's month: payments matched to charges, payouts to payments, what does not match, totals, chart, CSV, close. */
@Component({
  selector: 'rw-reconciliation-page',
  imports: [FormsModule, DatePipe, RouterLink, IncomeChart, MatButtonModule, MatCardModule, MatFormFieldModule, MatIconModule, MatInputModule, MatProgressBarModule],
  changeDetection: ChangeDetectionStrategy.OnPush,
  templateUrl: './reconciliation-page.html',
  styleUrl: './reconciliation-page.scss',
})
export class ReconciliationPage {
  private readonly api = inject(PaymentsApi);
  protected readonly month = signal(thisMonth());
  protected readonly current = thisMonth();
  protected readonly data = rxResource({ params: () => this.month(), stream: ({ params }) => this.api.month(params) });
  protected readonly methodLabels = METHOD_LABELS;
  protected readonly csvUrl = computed(() => this.api.csvUrl(this.month()));
  protected readonly closing = signal(false);
  protected readonly confirmClose = signal(false);
  protected readonly error = signal('');

  protected money(minor: number): string {
    return formatMoney(minor, this.data.hasValue() ? this.data.value().currency : 'GBP');
  }

  protected pick(value: string): void {
    if (/^\d{4}-(0[1-9]|1[0-2])$/.test(value)) {
      this.error.set('');
      this.confirmClose.set(false);
      this.month.set(value);
    }
  }

  protected close(): void {
    this.closing.set(true);
    this.api.closeMonth(this.month()).subscribe({
      next: (r) => {
        this.closing.set(false);
        this.confirmClose.set(false);
        this.data.set(r);
      },
      error: (e) => {
        this.closing.set(false);
        this.error.set(readApiError(e).message);
      },
    });
  }
}
