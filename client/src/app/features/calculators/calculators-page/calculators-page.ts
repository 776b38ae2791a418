import { ChangeDetectionStrategy, Component, DestroyRef, InjectionToken, Signal, inject, signal } from '@angular/core';
import { takeUntilDestroyed } from '@angular/core/rxjs-interop';
import { FormGroup, NonNullableFormBuilder, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatCardModule } from '@angular/material/card';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatSelectModule } from '@angular/material/select';
import { Observable, catchError, debounceTime, map, of, startWith, switchMap } from 'rxjs';
import { SERIAL_BAUDS, XMODEM_BLOCK_SIZES, type XmodemBlockSize, type XmodemCheckMode } from '@domain/xmodem';
import { AWG_GAUGES, DEFAULT_TOLERANCE_PCT, MM2_GAUGES, NOMINAL_SUPPLY_V } from '@domain/dc-lead';
import { readApiError } from '../../../core/http/api-error';
import { Caution } from '../../../shared/caution/caution';
import { controlMessage, placeServerError } from '../../../shared/form-errors';
import { CalcApi } from '../calc-api';
import { fixed, minutesSeconds, secondsText, swrText, wholeNumber } from '../calc-format';
import { DcDropQuery, DcLeadDrop, RfFigures, XmodemPlan } from '../calc.models';

/** Wait this long (ms) after the last keystroke before asking the server. Tests set it to 0. */
export const RECOMPUTE_DEBOUNCE_MS = new InjectionToken<number>('RECOMPUTE_DEBOUNCE_MS', { factory: () => 300 });

/** What a calculator card shows: its figures, or a message that is not about one field. */
export interface CalcState<R> {
  result: R | null;
  message: string;
}

/** Gauge choices as one select: "awg:12" or "mm2:2.5". */
export const GAUGE_CHOICES = [
  ...AWG_GAUGES.map((g) => ({ value: `awg:${g}`, label: `AWG ${g}` })),
  ...MM2_GAUGES.map((g) => ({ value: `mm2:${g}`, label: `${g} mm²` })),
];

/** Bench calculators: XMODEM time, RF figures and DC lead drop, recomputed by the API as you type. */
@Component({
  selector: 'rw-calculators-page',
  imports: [ReactiveFormsModule, Caution, MatCardModule, MatFormFieldModule, MatInputModule, MatSelectModule, MatIconModule],
  changeDetection: ChangeDetectionStrategy.OnPush,
  templateUrl: './calculators-page.html',
  styleUrl: './calculators-page.scss',
})
export class CalculatorsPage {
  private readonly api = inject(CalcApi);
  private readonly fb = inject(NonNullableFormBuilder);
  private readonly destroyRef = inject(DestroyRef);
  private readonly debounceMs = inject(RECOMPUTE_DEBOUNCE_MS);

  protected readonly bauds = SERIAL_BAUDS;
  protected readonly blockSizes = XMODEM_BLOCK_SIZES;
  protected readonly gauges = GAUGE_CHOICES;
  protected readonly message = controlMessage;
  protected readonly f = { fixed, minutesSeconds, secondsText, swrText, wholeNumber };

  protected readonly xmodemForm = this.fb.group({
    bytes: this.fb.control<number | null>(1_048_576, [Validators.required, Validators.min(1)]),
    block: this.fb.control<XmodemBlockSize>(1024),
    check: this.fb.control<XmodemCheckMode>('crc'),
    baud: this.fb.control<number>(115200),
  });

  protected readonly rfForm = this.fb.group({
    forwardW: this.fb.control<number | null>(100, [Validators.required, Validators.min(0)]),
    reflectedW: this.fb.control<number | null>(4, [Validators.required, Validators.min(0)]),
  });

  protected readonly dcForm = this.fb.group({
    currentA: this.fb.control<number | null>(20, [Validators.required, Validators.min(0)]),
    lengthM: this.fb.control<number | null>(2, [Validators.required, Validators.min(0)]),
    gauge: this.fb.control('awg:12'),
    supplyV: this.fb.control<number | null>(NOMINAL_SUPPLY_V, [Validators.required, Validators.min(0)]),
  });

  protected readonly defaultTolerancePct = DEFAULT_TOLERANCE_PCT;

  protected readonly xmodem: Signal<CalcState<XmodemPlan>> = this.recompute(this.xmodemForm, (v) =>
    this.api.xmodem({ bytes: v.bytes!, block: v.block, check: v.check, baud: v.baud }),
  );

  protected readonly rf: Signal<CalcState<RfFigures>> = this.recompute(this.rfForm, (v) =>
    this.api.rf({ forwardW: v.forwardW!, reflectedW: v.reflectedW! }),
  );

  protected readonly dc: Signal<CalcState<DcLeadDrop>> = this.recompute(
    this.dcForm,
    (v) => {
      const [unit, size] = v.gauge.split(':');
      const query: DcDropQuery = { currentA: v.currentA!, lengthM: v.lengthM!, supplyV: v.supplyV! };
      if (unit === 'awg') query.awg = Number(size) as DcDropQuery['awg'];
      else query.mm2 = Number(size) as DcDropQuery['mm2'];
      return this.api.dcDrop(query);
    },
    // The API names the gauge by its unit; the page has one gauge control.
    { awg: 'gauge', mm2: 'gauge' },
  );

  /**
   * Asks the API again whenever the form settles (debounced), dropping answers to older values
   * (switchMap). Server field errors go onto their controls; anything else becomes the message.
   */
  private recompute<F extends FormGroup, R>(
    form: F,
    call: (value: ReturnType<F['getRawValue']>) => Observable<R>,
    fieldAliases: Record<string, string> = {},
  ): Signal<CalcState<R>> {
    const state = signal<CalcState<R>>({ result: null, message: '' });
    form.valueChanges
      .pipe(
        startWith(null),
        debounceTime(this.debounceMs),
        map(() => {
          clearServerErrors(form);
          return form.valid ? (form.getRawValue() as ReturnType<F['getRawValue']>) : null;
        }),
        switchMap((value) => {
          if (value === null) return of<CalcState<R>>({ result: null, message: '' });
          return call(value).pipe(
            map((result): CalcState<R> => ({ result, message: '' })),
            catchError((err: unknown) => {
              const apiError = readApiError(err);
              const fields: Record<string, string> = {};
              for (const [name, text] of Object.entries(apiError.fields)) fields[fieldAliases[name] ?? name] = text;
              return of<CalcState<R>>({ result: null, message: placeServerError(form, { message: apiError.message, fields }) });
            }),
          );
        }),
        takeUntilDestroyed(this.destroyRef),
      )
      .subscribe((next) => state.set(next));
    return state.asReadonly();
  }
}

/** Drops the server's messages so the form's own validators decide again. */
function clearServerErrors(form: FormGroup): void {
  for (const control of Object.values(form.controls)) {
    if (control.hasError('server')) control.updateValueAndValidity({ emitEvent: false });
  }
  form.updateValueAndValidity({ emitEvent: false });
}
