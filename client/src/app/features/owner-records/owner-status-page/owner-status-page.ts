import { DatePipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, inject, input, signal } from '@angular/core';
import { rxResource } from '@angular/core/rxjs-interop';
import { MatButtonModule } from '@angular/material/button';
import { MatCardModule } from '@angular/material/card';
import { MatIconModule } from '@angular/material/icon';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import type { OwnerTimelineEntry } from '@contracts/owner-records';
import { formatMoney } from '@domain/quote';
import { readApiError } from '../../../core/http/api-error';
import { Caution } from '../../../shared/caution/caution';
import { stateLabel } from '../../../shared/labels';
import { StateChip } from '../../../shared/state-chip/state-chip';
import { OwnerRecordsApi } from '../owner-records-api';

/** In words for the owner: one line per timeline entry. */
export function ownerEntryText(e: OwnerTimelineEntry): string {
  switch (e.kind) {
    case 'opened':
      return 'Handed in at the bench.';
    case 'moved':
      return `Moved${e.fromState ? ` from ${stateLabel(e.fromState)}` : ''}${e.toState ? ` to ${stateLabel(e.toState)}` : ''}.`;
    case 'note':
      return 'A note from the bench:';
    case 'quote_written':
      return 'A quote was written.';
    case 'quote_approved':
      return 'You approved the quote.';
    case 'quote_declined':
      return 'You declined the quote.';
    case 'reflash_consent':
      return 'Consent to a reflash recorded.';
    default:
      return 'Update from the bench.';
  }
}

/** The owner's status page behind the e-mailed status link: no account, phone-friendly. */
@Component({
  selector: 'rw-owner-status-page',
  imports: [DatePipe, Caution, StateChip, MatButtonModule, MatCardModule, MatIconModule, MatProgressBarModule],
  changeDetection: ChangeDetectionStrategy.OnPush,
  templateUrl: './owner-status-page.html',
  styleUrls: ['../owner-records.scss', '../owner-page.scss'],
})
export class OwnerStatusPage {
  readonly tag = input.required<string>();
  readonly token = input.required<string>();
  private readonly api = inject(OwnerRecordsApi);

  protected readonly status = rxResource({ params: () => ({ tag: this.tag(), token: this.token() }), stream: ({ params }) => this.api.ownerStatus(params.tag, params.token) });
  protected readonly entryText = ownerEntryText;
  protected readonly money = formatMoney;
  protected readonly consenting = signal(false);
  protected readonly error = signal('');
  protected readonly loadError = () => readApiError(this.status.error()).message;

  protected readonly paying = signal(false);
  protected readonly payError = signal('');

  /** Off to the payment provider's checkout page for the whole balance; it comes back to this page. */
  protected pay(): void {
    if (this.paying()) return;
    this.paying.set(true);
    this.payError.set('');
    this.api.ownerCheckout(this.tag(), this.token()).subscribe({
      next: (c) => window.location.assign(c.url),
      error: (err: unknown) => {
        this.paying.set(false);
        this.payError.set(readApiError(err).message);
      },
    });
  }

  protected giveConsent(): void {
    if (this.consenting()) return;
    this.consenting.set(true);
    this.error.set('');
    this.api.ownerConsent(this.tag(), this.token()).subscribe({
      next: (v) => {
        this.status.value.set(v);
        this.consenting.set(false);
      },
      error: (err: unknown) => {
        this.consenting.set(false);
        this.error.set(readApiError(err).message);
      },
    });
  }
}
