// DTOs of the calculation routes (api/API.md, "Calculations"). The answer types are the domain's
// own, shared with the API through the @domain alias.
import type { XmodemBlockSize, XmodemCheckMode, XmodemPlan } from '@domain/xmodem';
import type { RfFigures } from '@domain/rf';
import type { AwgGauge, DcLeadDrop, Mm2Gauge } from '@domain/dc-lead';
import type { LevelUnit, SignalLevel, SMeterBand } from '@domain/levels';
import type { DummyLoadFigures } from '@domain/dummy-load';
import type { AttenuatorPad, PadShape } from '@domain/attenuator';
import type { CoaxLineLoss, LineLoss } from '@domain/line-loss';
import type { CoaxType } from '@domain/coax';
import type { Discharge } from '@domain/discharge';

export type { XmodemPlan, RfFigures, DcLeadDrop, SignalLevel, DummyLoadFigures, AttenuatorPad, LineLoss, CoaxLineLoss, Discharge };

export interface XmodemQuery {
  bytes: number;
  block: XmodemBlockSize;
  check: XmodemCheckMode;
  baud: number;
}

export interface RfQuery {
  forwardW: number;
  reflectedW: number;
}

export interface DcDropQuery {
  currentA: number;
  lengthM: number;
  awg?: AwgGauge;
  mm2?: Mm2Gauge;
  supplyV: number;
  tolerancePct?: number;
  conductorC?: number;
}

export interface LevelQuery {
  value: number;
  unit: LevelUnit;
  ohms: number;
  band: SMeterBand;
}

export interface DummyLoadQuery {
  watts: number;
  ohms: number;
}

export interface AttenuatorQuery {
  db: number;
  ohms: number;
  shape: PadShape;
  inputW: number;
}

export type LineLossQuery = { swr: number; matchedLossDb: number } | { swr: number; cable: CoaxType; lengthM: number; mhz: number };

export interface DischargeQuery {
  volts: number;
  farads: number;
  ohms: number;
  safeVolts: number;
}
