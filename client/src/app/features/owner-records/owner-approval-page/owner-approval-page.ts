import { DatePipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, inject, input, signal } from '@angular/core';
import { rxResource } from '@angular/core/rxjs-interop';
import { NonNullableFormBuilder, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatCardModule } from '@angular/material/card';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { QUOTE_STATUS_LABELS } from '@contracts/owner-records';
import { formatMoney } from '@domain/quote';
import { readApiError } from '../../../core/http/api-error';
import { Caution } from '../../../shared/caution/caution';
import { OwnerRecordsApi } from '../owner-records-api';
import { recordFieldMessage } from '../record-forms';

/** The quote approval page behind the e-mailed approval link: the ticket, the quote, the cautions, Approve or Decline. */
@Component({
  selector: 'rw-owner-approval-page',
  imports: [ReactiveFormsModule, DatePipe, Caution, MatButtonModule, MatCardModule, MatFormFieldModule, MatIconModule, MatInputModule, MatProgressBarModule],
  changeDetection: ChangeDetectionStrategy.OnPush,
  templateUrl: './owner-approval-page.html',
  styleUrls: ['../owner-records.scss', '../owner-page.scss'],
})
export class OwnerApprovalPage {
  readonly tag = input.required<string>();
  readonly token = input.required<string>();
  private readonly api = inject(OwnerRecordsApi);

  protected readonly view = rxResource({ params: () => ({ tag: this.tag(), token: this.token() }), stream: ({ params }) => this.api.ownerApproval(params.tag, params.token) });
  protected readonly money = formatMoney;
  protected readonly statusLabels = QUOTE_STATUS_LABELS;
  protected readonly message = recordFieldMessage;
  protected readonly form = inject(NonNullableFormBuilder).group({ reason: ['', [Validators.maxLength(500)]] });
  protected readonly sending = signal(false);
  protected readonly error = signal('');
  protected readonly loadError = () => readApiError(this.view.error()).message;

  protected decide(decision: 'approve' | 'decline'): void {
    if (this.sending() || this.form.invalid) return;
    const reason = this.form.controls.reason.value.trim();
    this.sending.set(true);
    this.error.set('');
    this.api.ownerDecides(this.tag(), this.token(), { decision, ...(decision === 'decline' && reason ? { reason } : {}) }).subscribe({
      next: (v) => {
        this.view.value.set(v);
        this.sending.set(false);
      },
      error: (err: unknown) => {
        this.sending.set(false);
        this.error.set(readApiError(err).message);
      },
    });
  }
}
