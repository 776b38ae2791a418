import { DatePipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, computed, inject, input, output, signal } from '@angular/core';
import { rxResource, toSignal } from '@angular/core/rxjs-interop';
import { NonNullableFormBuilder, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatCardModule } from '@angular/material/card';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { QUOTE_STATUS_LABELS } from '@contracts/owner-records';
import { MAX_QUOTE_LINES, decimalToMinor, formatMoney, lineTotalMinor, needsOwnerApproval, quantityToHundredths } from '@domain/quote';
import { startWith } from 'rxjs';
import { SessionStore } from '../../../core/auth/session-store';
import { readApiError } from '../../../core/http/api-error';
import { Notifier } from '../../../core/notifier';
import { TicketDetail } from '../../tickets/ticket.models';
import { OwnerRecordsApi } from '../owner-records-api';
import { optionalNumber, priceValidator, quantityValidator, recordFieldMessage } from '../record-forms';

/** Quotes on a ticket: the latest first; technicians write one in Diagnosis (above the club's threshold, the owner approves). */
@Component({
  selector: 'rw-quote-section',
  imports: [ReactiveFormsModule, DatePipe, MatCardModule, MatButtonModule, MatFormFieldModule, MatIconModule, MatInputModule],
  changeDetection: ChangeDetectionStrategy.OnPush,
  templateUrl: './quote-section.html',
  styleUrl: '../owner-records.scss',
})
export class QuoteSection {
  readonly ticket = input.required<TicketDetail>();
  readonly changed = output<void>();

  private readonly api = inject(OwnerRecordsApi);
  private readonly notifier = inject(Notifier);
  private readonly fb = inject(NonNullableFormBuilder);
  protected readonly session = inject(SessionStore);
  protected readonly statusLabels = QUOTE_STATUS_LABELS;
  protected readonly message = recordFieldMessage;
  protected readonly maxLines = MAX_QUOTE_LINES;

  protected readonly view = rxResource({ params: () => this.ticket().tag + ':' + this.ticket().version, stream: () => this.api.quotes(this.ticket().tag) });
  protected readonly currency = computed(() => (this.view.hasValue() ? this.view.value().settings.currency : 'GBP'));
  protected readonly money = (minor: number, currency = this.currency()) => formatMoney(minor, currency);

  protected readonly form = this.fb.group({
    lines: this.fb.array([this.newLine()]),
    note: ['', [Validators.maxLength(500)]],
  });
  private readonly values = toSignal(this.form.valueChanges.pipe(startWith(null)));
  /** The total as the server will compute it (same domain functions), or null while a line is not valid. */
  protected readonly total = computed(() => {
    this.values();
    let sum = 0;
    for (const l of this.form.controls.lines.controls) {
      const q = optionalNumber(l.controls.quantity.value);
      const p = decimalToMinor(l.controls.price.value, this.currency());
      if (q === null || p === null || l.invalid) return null;
      sum += lineTotalMinor({ quantityHundredths: quantityToHundredths(q), unitPriceMinor: p });
    }
    return sum;
  });
  protected readonly needsApproval = computed(() => {
    const t = this.total();
    return t !== null && this.view.hasValue() && needsOwnerApproval(t, this.view.value().settings.approvalThresholdMinor);
  });
  protected readonly sending = signal(false);
  protected readonly error = signal('');

  private newLine() {
    return this.fb.group({
      description: ['', [Validators.required, Validators.minLength(2), Validators.maxLength(200)]],
      quantity: ['1', [quantityValidator]],
      price: ['', [priceValidator(() => this.currency())]],
    });
  }

  protected addLine(): void {
    if (this.form.controls.lines.length < MAX_QUOTE_LINES) this.form.controls.lines.push(this.newLine());
  }

  protected removeLine(i: number): void {
    if (this.form.controls.lines.length > 1) this.form.controls.lines.removeAt(i);
  }

  protected submit(): void {
    if (this.sending()) return;
    if (this.form.invalid) {
      this.form.markAllAsTouched();
      this.error.set('Some lines need attention: see the messages under them.');
      return;
    }
    const v = this.form.getRawValue();
    this.sending.set(true);
    this.error.set('');
    this.api
      .writeQuote(this.ticket().tag, {
        lines: v.lines.map((l) => ({ description: l.description.trim(), quantity: optionalNumber(l.quantity)!, unitPriceMinor: decimalToMinor(l.price, this.currency())! })),
        ...(v.note.trim() ? { note: v.note.trim() } : {}),
      })
      .subscribe({
        next: (q) => {
          this.sending.set(false);
          this.form.controls.lines.clear();
          this.form.controls.lines.push(this.newLine());
          this.form.controls.note.reset('');
          this.notifier.info(q.status === 'pending' ? 'Quote saved; the owner has been sent an approval link.' : 'Quote saved; it needs no approval.');
          this.changed.emit();
        },
        error: (err: unknown) => {
          this.sending.set(false);
          this.error.set(readApiError(err).message);
        },
      });
  }
}
