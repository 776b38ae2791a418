export type {
  HandBackRecord,
  HandBackView,
  RepairLogView,
  RepairPartEntry,
  RepairWorkEntry,
  TestLimitsView,
  TestSheet,
  TestSheetSaved,
  TestSheetsView,
} from '@contracts/bench-records';

export interface WorkBody {
  description: string;
  minutes: number;
}

export interface PartBody {
  description: string;
  quantity: number;
  unitCostMinor: number;
}

export interface TestSheetBody {
  supplyVoltageV: number;
  receiveCurrentA: number;
  bands: { band: string; ratedW: number; forwardW: number; reflectedW: number; nominalHz: number | null; measuredHz: number | null }[];
  reference: string | null;
  notes: string | null;
}

export interface HandBackBody {
  items: { item: string; returned: boolean; note: string | null }[];
  extras: { item: string; note: string }[];
  collectedBy: string;
  collectedAt?: string;
}
