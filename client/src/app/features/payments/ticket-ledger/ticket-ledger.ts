import { DatePipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, computed, DestroyRef, effect, inject, input, signal, untracked } from '@angular/core';
import { rxResource, toSignal } from '@angular/core/rxjs-interop';
import { NonNullableFormBuilder, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatCardModule } from '@angular/material/card';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { MatSelectModule } from '@angular/material/select';
import { ActivatedRoute } from '@angular/router';
import type { ChargeDto, LedgerDto, PaymentDto } from '@contracts/payments';
import { map, of } from 'rxjs';
import { SessionStore } from '../../../core/auth/session-store';
import { readApiError } from '../../../core/http/api-error';
import { TicketDetail } from '../../tickets/ticket.models';
import { amountError, formatMoney, METHOD_LABELS, parseMajorUnits } from '../money-format';
import { PaymentsApi } from '../payments-api';

type Open = { kind: 'waive'; chargeId: number } | { kind: 'refund'; paymentId: number } | null;

/** A ticket's fees and payments: its charges, balance, paying online, and the bench's and treasurer's records. */
@Component({
  selector: 'rw-ticket-ledger',
  imports: [ReactiveFormsModule, DatePipe, MatButtonModule, MatCardModule, MatFormFieldModule, MatIconModule, MatInputModule, MatProgressBarModule, MatSelectModule],
  changeDetection: ChangeDetectionStrategy.OnPush,
  templateUrl: './ticket-ledger.html',
  styleUrl: './ticket-ledger.scss',
})
export class TicketLedger {
  readonly ticket = input.required<TicketDetail>();

  private readonly api = inject(PaymentsApi);
  private readonly fb = inject(NonNullableFormBuilder);
  protected readonly session = inject(SessionStore);
  private readonly paymentParam = toSignal(inject(ActivatedRoute).queryParamMap.pipe(map((q) => q.get('payment'))), { initialValue: null });

  protected readonly ledger = rxResource({ params: () => this.ticket().tag, stream: ({ params }) => this.api.ledger(params) });
  protected readonly isTreasurer = computed(() => this.session.hasAnyRole('treasurer'));
  protected readonly addsCharges = computed(() => this.session.hasAnyRole('technician', 'treasurer', 'admin'));
  protected readonly isOwner = computed(() => this.session.hasAnyRole('member') && this.session.user()?.email === this.ticket().ownerEmail);
  protected readonly seesReceipts = computed(() => this.isOwner() || this.session.hasAnyRole('treasurer', 'admin'));
  protected readonly fees = rxResource({ params: () => this.addsCharges(), stream: ({ params }) => (params ? this.api.fees() : of(null)) });
  protected readonly methodLabels = METHOD_LABELS;

  protected readonly busy = signal(false);
  protected readonly error = signal('');
  protected readonly open = signal<Open>(null);
  /** After the payment service sends the payer back: wait for its confirmation (the webhook) to arrive. */
  protected readonly confirming = signal(false);
  private polls = 0;

  protected readonly chargeForm = this.fb.group({
    feeItemId: [0 as number, Validators.required],
    quantity: [1, [Validators.required, Validators.min(1), Validators.max(1000)]],
    description: ['', [Validators.maxLength(200)]],
    amount: [''],
  });
  protected readonly payForm = this.fb.group({
    method: ['cash' as 'cash' | 'bank_transfer', Validators.required],
    amount: ['', Validators.required],
    reference: ['', [Validators.required, Validators.maxLength(100)]],
  });
  protected readonly fixForm = this.fb.group({ amount: ['', Validators.required], reason: ['', [Validators.required, Validators.maxLength(500)]] });

  constructor() {
    const destroyRef = inject(DestroyRef);
    let timer: ReturnType<typeof setTimeout> | undefined;
    destroyRef.onDestroy(() => clearTimeout(timer));
    effect(() => {
      const back = this.paymentParam();
      const l = this.ledger.hasValue() ? this.ledger.value() : null;
      untracked(() => {
        if (back !== 'done' || !l) return;
        if (l.balance === 0 || this.polls >= 20) {
          this.confirming.set(false);
          return;
        }
        this.confirming.set(true);
        this.polls++;
        clearTimeout(timer);
        timer = setTimeout(() => this.ledger.reload(), 1500);
      });
    });
  }

  protected money(minor: number): string {
    return formatMoney(minor, this.ledger.hasValue() ? this.ledger.value().currency : 'GBP');
  }

  protected payOnline(): void {
    this.busy.set(true);
    this.error.set('');
    this.api.checkout(this.ticket().tag).subscribe({
      next: (c) => window.location.assign(c.url),
      error: (e) => {
        this.busy.set(false);
        this.error.set(readApiError(e).message);
      },
    });
  }

  private done = (l: LedgerDto) => {
    this.busy.set(false);
    this.open.set(null);
    this.error.set('');
    this.ledger.set(l);
  };
  private failed = (e: unknown) => {
    this.busy.set(false);
    this.error.set(readApiError(e).message);
  };

  protected addCharge(currency: string): void {
    const v = this.chargeForm.getRawValue();
    if (v.feeItemId === 0) {
      const err = amountError(v.amount, currency);
      if (err || !v.description.trim()) return this.error.set(err ?? 'Say what the part is.');
      this.busy.set(true);
      this.api.addCharge(this.ticket().tag, { description: v.description.trim(), amount: parseMajorUnits(v.amount, currency)! }).subscribe({ next: (l) => (this.done(l), this.chargeForm.patchValue({ description: '', amount: '' })), error: this.failed });
      return;
    }
    if (this.chargeForm.controls.quantity.invalid) return this.error.set('The quantity is a whole number from 1 to 1000.');
    this.busy.set(true);
    this.api.addCharge(this.ticket().tag, { feeItemId: v.feeItemId, quantity: v.quantity }).subscribe({ next: this.done, error: this.failed });
  }

  protected recordPayment(currency: string): void {
    const v = this.payForm.getRawValue();
    const err = amountError(v.amount, currency);
    if (err) return this.error.set(err);
    if (!v.reference.trim()) return this.error.set('Give a reference: the cash book number or the bank reference.');
    this.busy.set(true);
    this.api.recordPayment(this.ticket().tag, { method: v.method, amount: parseMajorUnits(v.amount, currency)!, reference: v.reference.trim() }).subscribe({
      next: (l) => (this.done(l), this.payForm.reset({ method: 'cash', amount: '', reference: '' })),
      error: this.failed,
    });
  }

  protected startFix(open: Open, amount: number): void {
    this.error.set('');
    this.fixForm.reset({ amount: (amount / 100).toFixed(2), reason: '' });
    this.open.set(open);
  }

  protected submitFix(currency: string): void {
    const open = this.open();
    const v = this.fixForm.getRawValue();
    const err = amountError(v.amount, currency);
    if (err) return this.error.set(err);
    if (!v.reason.trim()) return this.error.set('Give the reason; it goes on the ticket\'s timeline.');
    const body = { amount: parseMajorUnits(v.amount, currency)!, reason: v.reason.trim() };
    this.busy.set(true);
    if (open?.kind === 'waive') this.api.waive(open.chargeId, body).subscribe({ next: this.done, error: this.failed });
    else if (open?.kind === 'refund') this.api.refund(open.paymentId, body).subscribe({ next: this.done, error: this.failed });
  }

  protected receiptUrl(p: PaymentDto): string {
    return this.api.receiptUrl(p.id);
  }

  protected isOpen(kind: 'waive' | 'refund', id: number): boolean {
    const o = this.open();
    return !!o && o.kind === kind && (kind === 'waive' ? (o as { chargeId: number }).chargeId : (o as { paymentId: number }).paymentId) === id;
  }

  protected trackCharge = (_: number, c: ChargeDto) => c.id;
}
