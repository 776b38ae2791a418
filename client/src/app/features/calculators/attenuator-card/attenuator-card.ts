import { ChangeDetectionStrategy, Component, DestroyRef, inject } from '@angular/core';
import { NonNullableFormBuilder, ReactiveFormsModule } from '@angular/forms';
import { MatCardModule } from '@angular/material/card';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatSelectModule } from '@angular/material/select';
import type { PadShape } from '@domain/attenuator';
import { CalcApi } from '../calc-api';
import { fixed, siText, signedPercent } from '../calc-format';
import { decimalValidator, decimalValue } from '../decimal';
import { RECOMPUTE_DEBOUNCE_MS, calcFieldMessage, recomputeOnChange } from '../recompute';

/** Matched pi and tee pads: exact values, the nearest E24 resistors, and their power. */
@Component({
  selector: 'rw-attenuator-card',
  imports: [ReactiveFormsModule, MatCardModule, MatFormFieldModule, MatInputModule, MatSelectModule, MatIconModule],
  changeDetection: ChangeDetectionStrategy.OnPush,
  templateUrl: './attenuator-card.html',
  styleUrl: '../calc-card.scss',
})
export class AttenuatorCard {
  private readonly api = inject(CalcApi);
  private readonly fb = inject(NonNullableFormBuilder);

  protected readonly message = calcFieldMessage;
  protected readonly f = { fixed, siText, signedPercent };

  protected readonly form = this.fb.group({
    db: this.fb.control('10', [decimalValidator]),
    shape: this.fb.control<PadShape>('pi'),
    ohms: this.fb.control('50', [decimalValidator]),
    inputW: this.fb.control('5', [decimalValidator]),
  });

  protected readonly pad = recomputeOnChange(
    this.form,
    (v) => this.api.attenuator({ db: decimalValue(v.db), shape: v.shape, ohms: decimalValue(v.ohms), inputW: decimalValue(v.inputW) }),
    { debounceMs: inject(RECOMPUTE_DEBOUNCE_MS), destroyRef: inject(DestroyRef) },
  );
}
