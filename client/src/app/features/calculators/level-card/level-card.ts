import { ChangeDetectionStrategy, Component, DestroyRef, inject } from '@angular/core';
import { NonNullableFormBuilder, ReactiveFormsModule } from '@angular/forms';
import { MatCardModule } from '@angular/material/card';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatSelectModule } from '@angular/material/select';
import { S9_DBM, type LevelUnit, type SMeterBand } from '@domain/levels';
import { CalcApi } from '../calc-api';
import { fixed, siText, sMeterText } from '../calc-format';
import { decimalValidator, decimalValue } from '../decimal';
import { RECOMPUTE_DEBOUNCE_MS, calcFieldMessage, recomputeOnChange } from '../recompute';

export const LEVEL_UNIT_CHOICES: { value: LevelUnit; label: string }[] = [
  { value: 'dBm', label: 'dBm' },
  { value: 'dBW', label: 'dBW' },
  { value: 'dBuV', label: 'dBµV' },
  { value: 'uV', label: 'µV' },
  { value: 'mW', label: 'mW' },
  { value: 'W', label: 'W' },
];

/** Signal level in every unit, and the S-meter reading it should give (IARU Region 1 R.1). */
@Component({
  selector: 'rw-level-card',
  imports: [ReactiveFormsModule, MatCardModule, MatFormFieldModule, MatInputModule, MatSelectModule, MatIconModule],
  changeDetection: ChangeDetectionStrategy.OnPush,
  templateUrl: './level-card.html',
  styleUrl: '../calc-card.scss',
})
export class LevelCard {
  private readonly api = inject(CalcApi);
  private readonly fb = inject(NonNullableFormBuilder);

  protected readonly units = LEVEL_UNIT_CHOICES;
  protected readonly s9 = S9_DBM;
  protected readonly message = calcFieldMessage;
  protected readonly f = { fixed, siText, sMeterText };

  protected readonly form = this.fb.group({
    value: this.fb.control('-73', [decimalValidator]),
    unit: this.fb.control<LevelUnit>('dBm'),
    ohms: this.fb.control('50', [decimalValidator]),
    band: this.fb.control<SMeterBand>('hf'),
  });

  protected readonly level = recomputeOnChange(
    this.form,
    (v) => this.api.level({ value: decimalValue(v.value), unit: v.unit, ohms: decimalValue(v.ohms), band: v.band }),
    { debounceMs: inject(RECOMPUTE_DEBOUNCE_MS), destroyRef: inject(DestroyRef) },
  );
}
