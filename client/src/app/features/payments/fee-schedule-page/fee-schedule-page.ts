import { ChangeDetectionStrategy, Component, inject, signal } from '@angular/core';
import { rxResource } from '@angular/core/rxjs-interop';
import { NonNullableFormBuilder, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatCardModule } from '@angular/material/card';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { MatSelectModule } from '@angular/material/select';
import { RouterLink } from '@angular/router';
import type { FeeScheduleDto, FeeUnit } from '@contracts/payments';
import { readApiError } from '../../../core/http/api-error';
import { amountError, formatMoney, parseMajorUnits } from '../money-format';
import { PaymentsApi } from '../payments-api';

/** The fee schedule: items with member and non-member prices from a date. A change never alters charges already made. */
@Component({
  selector: 'rw-fee-schedule-page',
  imports: [ReactiveFormsModule, RouterLink, MatButtonModule, MatCardModule, MatFormFieldModule, MatIconModule, MatInputModule, MatProgressBarModule, MatSelectModule],
  changeDetection: ChangeDetectionStrategy.OnPush,
  templateUrl: './fee-schedule-page.html',
  styleUrl: './fee-schedule-page.scss',
})
export class FeeSchedulePage {
  private readonly api = inject(PaymentsApi);
  private readonly fb = inject(NonNullableFormBuilder);
  protected readonly schedule = rxResource({ stream: () => this.api.fees() });
  protected readonly busy = signal(false);
  protected readonly error = signal('');
  protected readonly fields = signal<Record<string, string>>({});

  protected readonly form = this.fb.group({
    feeId: [0 as number],
    code: ['', [Validators.pattern(/^[a-z][a-z0-9_]{1,39}$/)]],
    name: ['', [Validators.maxLength(100)]],
    unit: ['each' as FeeUnit],
    memberPrice: ['', Validators.required],
    nonMemberPrice: ['', Validators.required],
    effectiveFrom: ['', Validators.required],
  });

  protected money(minor: number, s: FeeScheduleDto): string {
    return formatMoney(minor, s.currency);
  }

  protected save(s: FeeScheduleDto): void {
    const v = this.form.getRawValue();
    const problems: Record<string, string> = {};
    for (const key of ['memberPrice', 'nonMemberPrice'] as const) {
      const err = amountError(v[key], s.currency, { min: 0 });
      if (err) problems[key] = err;
    }
    if (!/^\d{4}-\d{2}-\d{2}$/.test(v.effectiveFrom)) problems['effectiveFrom'] = 'Choose the first day the price applies.';
    else if (v.effectiveFrom < s.today) problems['effectiveFrom'] = `Start today (${s.today}) or later: charges already made keep their price.`;
    if (v.feeId === 0) {
      if (!/^[a-z][a-z0-9_]{1,39}$/.test(v.code)) problems['code'] = 'Lower-case letters, digits and _, starting with a letter (e.g. reflash).';
      if (!v.name.trim()) problems['name'] = 'Give the item a name.';
    }
    this.fields.set(problems);
    if (Object.keys(problems).length) return this.error.set('Some fields need attention.');
    const prices = { memberPrice: parseMajorUnits(v.memberPrice, s.currency)!, nonMemberPrice: parseMajorUnits(v.nonMemberPrice, s.currency)!, effectiveFrom: v.effectiveFrom };
    this.busy.set(true);
    const call = v.feeId === 0 ? this.api.createFee({ code: v.code, name: v.name.trim(), unit: v.unit, ...prices }) : this.api.addPrice(v.feeId, prices);
    call.subscribe({
      next: (next) => {
        this.busy.set(false);
        this.error.set('');
        this.schedule.set(next);
        this.form.reset({ feeId: 0, code: '', name: '', unit: 'each', memberPrice: '', nonMemberPrice: '', effectiveFrom: '' });
      },
      error: (e) => {
        this.busy.set(false);
        const err = readApiError(e);
        this.fields.set(err.fields);
        this.error.set(err.message);
      },
    });
  }
}
