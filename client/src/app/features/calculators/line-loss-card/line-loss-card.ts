import { ChangeDetectionStrategy, Component, DestroyRef, inject } from '@angular/core';
import { toSignal } from '@angular/core/rxjs-interop';
import { NonNullableFormBuilder, ReactiveFormsModule } from '@angular/forms';
import { MatCardModule } from '@angular/material/card';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatSelectModule } from '@angular/material/select';
import { COAX, COAX_TYPES, type CoaxType } from '@domain/coax';
import { CalcApi } from '../calc-api';
import { fixed, swrText } from '../calc-format';
import { decimalValidator, decimalValue } from '../decimal';
import { RECOMPUTE_DEBOUNCE_MS, calcFieldMessage, recomputeOnChange } from '../recompute';

/** "typed": the matched loss is typed in; otherwise one of the coax types from the makers' figures. */
export type LineChoice = 'typed' | CoaxType;

/** Feed-line loss with SWR at the load; the matched loss typed in or from a coax maker's formula. */
@Component({
  selector: 'rw-line-loss-card',
  imports: [ReactiveFormsModule, MatCardModule, MatFormFieldModule, MatInputModule, MatSelectModule, MatIconModule],
  changeDetection: ChangeDetectionStrategy.OnPush,
  templateUrl: './line-loss-card.html',
  styleUrl: '../calc-card.scss',
})
export class LineLossCard {
  private readonly api = inject(CalcApi);
  private readonly fb = inject(NonNullableFormBuilder);

  protected readonly cables = COAX_TYPES.map((type) => ({ value: type, label: COAX[type].name }));
  protected readonly message = calcFieldMessage;
  protected readonly f = { fixed, swrText };

  protected readonly form = this.fb.group({
    line: this.fb.control<LineChoice>('lmr-400'),
    matchedLossDb: this.fb.control('1', [decimalValidator]),
    lengthM: this.fb.control('30', [decimalValidator]),
    mhz: this.fb.control('14.2', [decimalValidator]),
    swr: this.fb.control('2', [decimalValidator]),
  });

  protected readonly line = toSignal(this.form.controls.line.valueChanges, { initialValue: this.form.controls.line.value });

  constructor() {
    // Only the fields of the chosen way count: the others are disabled (and skipped by validation).
    const apply = (choice: LineChoice) => {
      const typed = choice === 'typed';
      for (const [control, on] of [
        [this.form.controls.matchedLossDb, typed],
        [this.form.controls.lengthM, !typed],
        [this.form.controls.mhz, !typed],
      ] as const) {
        if (on) control.enable({ emitEvent: false });
        else control.disable({ emitEvent: false });
      }
    };
    apply(this.form.controls.line.value);
    this.form.controls.line.valueChanges.subscribe(apply);
  }

  protected readonly loss = recomputeOnChange(
    this.form,
    (v) =>
      v.line === 'typed'
        ? this.api.lineLoss({ swr: decimalValue(v.swr), matchedLossDb: decimalValue(v.matchedLossDb) })
        : this.api.lineLoss({ swr: decimalValue(v.swr), cable: v.line, lengthM: decimalValue(v.lengthM), mhz: decimalValue(v.mhz) }),
    { debounceMs: inject(RECOMPUTE_DEBOUNCE_MS), destroyRef: inject(DestroyRef), fieldAliases: { cable: 'line' } },
  );
}
