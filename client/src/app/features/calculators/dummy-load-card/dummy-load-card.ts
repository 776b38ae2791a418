import { ChangeDetectionStrategy, Component, DestroyRef, inject } from '@angular/core';
import { NonNullableFormBuilder, ReactiveFormsModule } from '@angular/forms';
import { MatCardModule } from '@angular/material/card';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { CalcApi } from '../calc-api';
import { fixed, siText } from '../calc-format';
import { decimalValidator, decimalValue } from '../decimal';
import { RECOMPUTE_DEBOUNCE_MS, calcFieldMessage, recomputeOnChange } from '../recompute';

/** What a scope across the dummy load should show for a power: checks a wattmeter. */
@Component({
  selector: 'rw-dummy-load-card',
  imports: [ReactiveFormsModule, MatCardModule, MatFormFieldModule, MatInputModule, MatIconModule],
  changeDetection: ChangeDetectionStrategy.OnPush,
  templateUrl: './dummy-load-card.html',
  styleUrl: '../calc-card.scss',
})
export class DummyLoadCard {
  private readonly api = inject(CalcApi);
  private readonly fb = inject(NonNullableFormBuilder);

  protected readonly message = calcFieldMessage;
  protected readonly f = { fixed, siText };

  protected readonly form = this.fb.group({
    watts: this.fb.control('100', [decimalValidator]),
    ohms: this.fb.control('50', [decimalValidator]),
  });

  protected readonly load = recomputeOnChange(
    this.form,
    (v) => this.api.dummyLoad({ watts: decimalValue(v.watts), ohms: decimalValue(v.ohms) }),
    { debounceMs: inject(RECOMPUTE_DEBOUNCE_MS), destroyRef: inject(DestroyRef) },
  );
}
