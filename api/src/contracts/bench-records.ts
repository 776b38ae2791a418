// The API's data shapes for the repair log, test sheets, test limits and hand-back (client:
// `@contracts/bench-records`). Plain TypeScript: types and `as const` lists only.
import type { BandFigures, BandInput, SheetCheck, TestLimitKey, TestLimits } from '../domain/test-sheet';
import type { Page } from './lists';

export const REPAIR_LOG_KINDS = ['work', 'parts'] as const;
export type RepairLogKind = (typeof REPAIR_LOG_KINDS)[number];

/** A work-log entry of `GET /api/tickets/:tag/repair-log?kind=work`. */
export interface RepairWorkEntry {
  id: number;
  description: string;
  minutes: number;
  technicianName: string | null;
  at: string;
}

/** A part of `GET /api/tickets/:tag/repair-log?kind=parts`; costs in integer minor units of the club's currency. */
export interface RepairPartEntry {
  id: number;
  description: string;
  quantity: number;
  unitCostMinor: number;
  costMinor: number;
  technicianName: string | null;
  at: string;
}

/** `GET /api/tickets/:tag/repair-log`: one page of work or parts, and the ticket's totals. */
export interface RepairLogView {
  tag: string;
  canRecord: boolean;
  /** Why entries cannot be recorded now (null when they can). */
  reason: string | null;
  totals: { minutes: number; workEntries: number; parts: number; partsCostMinor: number };
  work: Page<RepairWorkEntry> | null;
  parts: Page<RepairPartEntry> | null;
}

/** `GET /api/test-limits` and the answer of `PATCH /api/test-limits`. */
export interface TestLimitsView {
  limits: TestLimits;
  /** Keys an admin has set; the others are the defaults. */
  custom: TestLimitKey[];
  updatedAt: string | null;
}

/** One band line of a saved sheet: the readings and every figure computed from them. */
export interface TestSheetBand extends BandInput, BandFigures {}

/** A saved test sheet (`GET /api/tickets/:tag/test-sheets`, newest first). */
export interface TestSheet {
  id: number;
  number: number;
  passed: boolean;
  supplyVoltageV: number;
  receiveCurrentA: number;
  reference: string | null;
  notes: string | null;
  bands: TestSheetBand[];
  checks: SheetCheck[];
  limits: TestLimits;
  technicianName: string | null;
  at: string;
  reportUrl: string;
}

export interface TestSheetsView {
  tag: string;
  canRecord: boolean;
  reason: string | null;
  /** The latest sheet's result, or null when there is none. */
  latestPassed: boolean | null;
  sheets: Page<TestSheet>;
}

/** `POST /api/tickets/:tag/test-sheets`: the sheet, and the move a failed sheet made. */
export interface TestSheetSaved {
  sheet: TestSheet;
  /** 'repair' when the failed sheet sent the ticket to Repair. */
  movedTo: 'repair' | null;
  /** Why a failed sheet could not move the ticket (it stays in Bench test), or null. */
  moveRefused: string | null;
  /** Whether the report was queued for the owner by e-mail. */
  mailed: boolean;
}

export interface HandBackItem {
  item: string;
  returned: boolean;
  /** Required when the item is not returned. */
  note: string | null;
}

export interface HandBackExtra {
  item: string;
  note: string;
}

export interface HandBackRecord {
  id: number;
  items: HandBackItem[];
  extras: HandBackExtra[];
  collectedBy: string;
  collectedAt: string;
  technicianName: string | null;
  at: string;
}

/** `GET /api/tickets/:tag/hand-back`. */
export interface HandBackView {
  tag: string;
  /** What was handed in (the checklist starts from it). */
  accessories: string[];
  canRecord: boolean;
  reason: string | null;
  /** The hand-back recorded since the ticket last came to Return (null: none yet). */
  current: HandBackRecord | null;
}
