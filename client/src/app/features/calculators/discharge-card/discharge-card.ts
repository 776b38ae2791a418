import { ChangeDetectionStrategy, Component, DestroyRef, inject } from '@angular/core';
import { NonNullableFormBuilder, ReactiveFormsModule } from '@angular/forms';
import { MatCardModule } from '@angular/material/card';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { DEFAULT_SAFE_VOLTS } from '@domain/discharge';
import { CalcApi } from '../calc-api';
import { fixed, minutesSeconds, secondsText, siText } from '../calc-format';
import { decimalValidator, decimalValue } from '../decimal';
import { RECOMPUTE_DEBOUNCE_MS, calcFieldMessage, recomputeOnChange } from '../recompute';

/**
 * Time for a bleeder to bring a filter capacitor down to a safe voltage, the energy stored, and
 * the power the bleeder takes at first. Capacitance in µF and resistance in kΩ, as printed on parts.
 */
@Component({
  selector: 'rw-discharge-card',
  imports: [ReactiveFormsModule, MatCardModule, MatFormFieldModule, MatInputModule, MatIconModule],
  changeDetection: ChangeDetectionStrategy.OnPush,
  templateUrl: './discharge-card.html',
  styleUrl: '../calc-card.scss',
})
export class DischargeCard {
  private readonly api = inject(CalcApi);
  private readonly fb = inject(NonNullableFormBuilder);

  protected readonly message = calcFieldMessage;
  protected readonly f = { fixed, minutesSeconds, secondsText, siText };

  protected readonly form = this.fb.group({
    volts: this.fb.control('400', [decimalValidator]),
    microfarads: this.fb.control('470', [decimalValidator]),
    kiloohms: this.fb.control('100', [decimalValidator]),
    safeVolts: this.fb.control(String(DEFAULT_SAFE_VOLTS), [decimalValidator]),
  });

  protected readonly discharge = recomputeOnChange(
    this.form,
    (v) =>
      this.api.discharge({
        volts: decimalValue(v.volts),
        // µF → F and kΩ → Ω; the toPrecision keeps 470 µF as 0.00047, not 0.00047000000000000004.
        farads: Number((decimalValue(v.microfarads) * 1e-6).toPrecision(12)),
        ohms: Number((decimalValue(v.kiloohms) * 1e3).toPrecision(12)),
        safeVolts: decimalValue(v.safeVolts),
      }),
    { debounceMs: inject(RECOMPUTE_DEBOUNCE_MS), destroyRef: inject(DestroyRef), fieldAliases: { farads: 'microfarads', ohms: 'kiloohms' } },
  );
}
