// DTOs of the calculation routes (api/API.md, "Calculations"). The answer types are the domain's
// own, shared with the API through the @domain alias.
import type { XmodemBlockSize, XmodemCheckMode, XmodemPlan } from '@domain/xmodem';
import type { RfFigures } from '@domain/rf';
import type { AwgGauge, DcLeadDrop, Mm2Gauge } from '@domain/dc-lead';

export type { XmodemPlan, RfFigures, DcLeadDrop };

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
}
