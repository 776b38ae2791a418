import { ChangeDetectionStrategy, Component, DestroyRef, Signal, inject } from '@angular/core';
import { NonNullableFormBuilder, ReactiveFormsModule } from '@angular/forms';
import { MatCardModule } from '@angular/material/card';
import { ErrorStateMatcher, ShowOnDirtyErrorStateMatcher } from '@angular/material/core';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatSelectModule } from '@angular/material/select';
import { SERIAL_BAUDS, XMODEM_BLOCK_SIZES, type XmodemBlockSize, type XmodemCheckMode } from '@domain/xmodem';
import { AWG_GAUGES, DEFAULT_CONDUCTOR_C, DEFAULT_TOLERANCE_PCT, MM2_GAUGES, NOMINAL_SUPPLY_V } from '@domain/dc-lead';
import { Caution } from '../../../shared/caution/caution';
import { CalcApi } from '../calc-api';
import { fixed, minutesSeconds, secondsText, swrText, wholeNumber } from '../calc-format';
import { DcDropQuery, DcLeadDrop, RfFigures, XmodemPlan } from '../calc.models';
import { decimalValidator, decimalValue } from '../decimal';
import { CalcState, RECOMPUTE_DEBOUNCE_MS, calcFieldMessage, recomputeOnChange } from '../recompute';
import { LevelCard } from '../level-card/level-card';
import { DummyLoadCard } from '../dummy-load-card/dummy-load-card';
import { AttenuatorCard } from '../attenuator-card/attenuator-card';
import { LineLossCard } from '../line-loss-card/line-loss-card';
import { DischargeCard } from '../discharge-card/discharge-card';

export { RECOMPUTE_DEBOUNCE_MS, type CalcState } from '../recompute';

/** Gauge choices as one select: "awg:12" or "mm2:2.5". */
export const GAUGE_CHOICES = [
  ...AWG_GAUGES.map((g) => ({ value: `awg:${g}`, label: `AWG ${g}` })),
  ...MM2_GAUGES.map((g) => ({ value: `mm2:${g}`, label: `${g} mm²` })),
];

/**
 * Bench calculators: XMODEM time, RF figures, signal level, dummy load, attenuator pad, feed-line
 * loss, DC lead and capacitor discharge, recomputed by the API as you type. Numbers are typed in
 * text fields read by `readDecimal` (a decimal comma is a decimal point, never dropped).
 */
@Component({
  selector: 'rw-calculators-page',
  imports: [
    ReactiveFormsModule,
    Caution,
    MatCardModule,
    MatFormFieldModule,
    MatInputModule,
    MatSelectModule,
    MatIconModule,
    LevelCard,
    DummyLoadCard,
    AttenuatorCard,
    LineLossCard,
    DischargeCard,
  ],
  changeDetection: ChangeDetectionStrategy.OnPush,
  // The cards recompute as you type, so a field's message shows as you type too, not only on leaving it.
  providers: [{ provide: ErrorStateMatcher, useClass: ShowOnDirtyErrorStateMatcher }],
  templateUrl: './calculators-page.html',
  styleUrls: ['./calculators-page.scss', '../calc-card.scss'],
})
export class CalculatorsPage {
  private readonly api = inject(CalcApi);
  private readonly fb = inject(NonNullableFormBuilder);
  private readonly recomputeOptions = { debounceMs: inject(RECOMPUTE_DEBOUNCE_MS), destroyRef: inject(DestroyRef) };

  protected readonly bauds = SERIAL_BAUDS;
  protected readonly blockSizes = XMODEM_BLOCK_SIZES;
  protected readonly gauges = GAUGE_CHOICES;
  protected readonly message = calcFieldMessage;
  protected readonly f = { fixed, minutesSeconds, secondsText, swrText, wholeNumber };

  protected readonly xmodemForm = this.fb.group({
    bytes: this.fb.control('1048576', [decimalValidator]),
    block: this.fb.control<XmodemBlockSize>(1024),
    check: this.fb.control<XmodemCheckMode>('crc'),
    baud: this.fb.control<number>(115200),
  });

  protected readonly rfForm = this.fb.group({
    forwardW: this.fb.control('100', [decimalValidator]),
    reflectedW: this.fb.control('4', [decimalValidator]),
  });

  protected readonly dcForm = this.fb.group({
    currentA: this.fb.control('20', [decimalValidator]),
    lengthM: this.fb.control('2', [decimalValidator]),
    gauge: this.fb.control('awg:12'),
    supplyV: this.fb.control(String(NOMINAL_SUPPLY_V), [decimalValidator]),
    conductorC: this.fb.control(String(DEFAULT_CONDUCTOR_C), [decimalValidator]),
  });

  protected readonly defaultTolerancePct = DEFAULT_TOLERANCE_PCT;

  protected readonly xmodem: Signal<CalcState<XmodemPlan>> = recomputeOnChange(
    this.xmodemForm,
    (v) => this.api.xmodem({ bytes: decimalValue(v.bytes), block: v.block, check: v.check, baud: v.baud }),
    this.recomputeOptions,
  );

  protected readonly rf: Signal<CalcState<RfFigures>> = recomputeOnChange(
    this.rfForm,
    (v) => this.api.rf({ forwardW: decimalValue(v.forwardW), reflectedW: decimalValue(v.reflectedW) }),
    this.recomputeOptions,
  );

  protected readonly dc: Signal<CalcState<DcLeadDrop>> = recomputeOnChange(
    this.dcForm,
    (v) => {
      const [unit, size] = v.gauge.split(':');
      const query: DcDropQuery = {
        currentA: decimalValue(v.currentA),
        lengthM: decimalValue(v.lengthM),
        supplyV: decimalValue(v.supplyV),
        conductorC: decimalValue(v.conductorC),
      };
      if (unit === 'awg') query.awg = Number(size) as DcDropQuery['awg'];
      else query.mm2 = Number(size) as DcDropQuery['mm2'];
      return this.api.dcDrop(query);
    },
    // The API names the gauge by its unit; the page has one gauge control.
    { ...this.recomputeOptions, fieldAliases: { awg: 'gauge', mm2: 'gauge' } },
  );
}
