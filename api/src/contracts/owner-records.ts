// Shapes of the diagnosis record, reflash consent, notes, quotes and the owner's links (issue 7),
// shared with the client as `@contracts/owner-records`. Plain TypeScript, no imports but types.
import type { TicketState } from '../domain/workflow';

/** The first checks of a diagnosis, in the order they are done (the soft-reset sequence first). */
export const DIAGNOSIS_CHECKS = ['cableOut', 'dcRemoved', 'waited', 'poweredCableOut', 'supplyUnderLoad', 'idleCurrent', 'transmitCurrent'] as const;
export type DiagnosisCheck = (typeof DIAGNOSIS_CHECKS)[number];

export const DIAGNOSIS_CHECK_LABELS: Record<DiagnosisCheck, string> = {
  cableOut: 'Control cable unplugged',
  dcRemoved: 'DC power removed',
  waited: 'Waited with power off',
  poweredCableOut: 'Powered up with the cable still out',
  supplyUnderLoad: 'Supply voltage at the radio under load',
  idleCurrent: 'Idle (receive) current',
  transmitCurrent: 'Transmit current',
};

export const DIAGNOSIS_DECISIONS = ['reflash', 'repair', 'return_unrepaired'] as const;
export type DiagnosisDecision = (typeof DIAGNOSIS_DECISIONS)[number];
export const DIAGNOSIS_DECISION_LABELS: Record<DiagnosisDecision, string> = {
  reflash: 'Reflash',
  repair: 'Repair',
  return_unrepaired: 'Return unrepaired',
};

export interface CheckResult {
  done: boolean;
  /** What the check showed, e.g. "still dark" or "13.1 V". */
  result: string | null;
}

/** The DC lead as found, for the lead calculator beside the measurements. */
export interface LeadAsFound {
  /** One-way length, metres. */
  lengthM: number;
  /** "awg:12" or "mm2:2.5". */
  gauge: string;
  /** Voltage at the supply's terminals, volts. */
  sourceV: number;
}

/** `GET /api/tickets/:tag/diagnosis` (and the answer of PUT). `version` 0 and `savedAt` null before the first save. */
export interface DiagnosisRecord {
  tag: string;
  /** Saving is possible only while the ticket is in Diagnosis. */
  editable: boolean;
  checks: Record<DiagnosisCheck, CheckResult>;
  supplyAtRadioV: number | null;
  idleCurrentA: number | null;
  transmitCurrentA: number | null;
  lead: LeadAsFound | null;
  findings: string | null;
  decision: DiagnosisDecision | null;
  returnReason: string | null;
  version: number;
  savedAt: string | null;
  savedBy: string | null;
}

export const CONSENT_METHODS = ['phone', 'in_person', 'owner_link'] as const;
export type ConsentMethod = (typeof CONSENT_METHODS)[number];
export const CONSENT_METHOD_LABELS: Record<ConsentMethod, string> = {
  phone: 'by phone call',
  in_person: 'in person',
  owner_link: "through the owner's status link",
};

/** `GET|POST /api/tickets/:tag/reflash-consent`. */
export interface ReflashConsentView {
  given: boolean;
  records: { method: ConsentMethod; recordedBy: string | null; note: string | null; at: string }[];
}

export const NOTE_AUDIENCES = ['internal', 'owner'] as const;
export type NoteAudience = (typeof NOTE_AUDIENCES)[number];
/** The chip on every note: who will read it. */
export const NOTE_AUDIENCE_LABELS: Record<NoteAudience, string> = { internal: 'Bench only', owner: 'Owner can read' };

/** One row of `GET /api/tickets/:tag/notes` (newest first); also the answer of POST. */
export interface TicketNote {
  id: number;
  at: string;
  authorName: string | null;
  audience: NoteAudience;
  text: string;
}

export const QUOTE_STATUSES = ['pending', 'approved', 'declined', 'not_needed', 'superseded'] as const;
export type QuoteStatus = (typeof QUOTE_STATUSES)[number];
export const QUOTE_STATUS_LABELS: Record<QuoteStatus, string> = {
  pending: 'Owner to approve',
  approved: 'Approved by the owner',
  declined: 'Declined by the owner',
  not_needed: 'No approval needed',
  superseded: 'Replaced by a newer quote',
};

export interface QuoteLine {
  description: string;
  /** Decimal, up to two places (1.5 hours). */
  quantity: number;
  unitPriceMinor: number;
  lineTotalMinor: number;
}

export interface Quote {
  id: number;
  status: QuoteStatus;
  currency: string;
  lines: QuoteLine[];
  totalMinor: number;
  /** The club's approval threshold when the quote was written. */
  thresholdMinor: number;
  note: string | null;
  writtenBy: string | null;
  at: string;
  decidedAt: string | null;
  declineReason: string | null;
}

/** `GET /api/club/quote-settings`. */
export interface QuoteSettings {
  /** ISO 4217 code, e.g. GBP. */
  currency: string;
  /** Quotes above this total (minor units) wait for the owner's approval. */
  approvalThresholdMinor: number;
}

/** `GET /api/tickets/:tag/quotes`: newest first, with the settings a new quote would use. */
export interface QuotesView {
  quotes: Quote[];
  settings: QuoteSettings;
  /** Quotes are written while the ticket is in Diagnosis. */
  canWrite: boolean;
  reason: string | null;
}

/** An event the owner may read (status page): never an internal one. */
export interface OwnerTimelineEntry {
  at: string;
  kind: string;
  fromState: TicketState | null;
  toState: TicketState | null;
  note: string | null;
}

/** `GET /api/owner/status/:tag/:token`. */
export interface OwnerStatusView {
  tag: string;
  clubName: string;
  makeModel: string;
  state: TicketState;
  stateSince: string;
  /** One sentence: what happens next in this state. */
  nextStep: string;
  reflashConsent: boolean;
  /** The owner can give consent here (not given yet, ticket still open). */
  canGiveConsent: boolean;
  /** A quote that waits for the owner (the approval link came in its own e-mail). */
  pendingQuote: Quote | null;
  /** What the owner owes on the ticket, in integer minor units of `currency` (0: nothing). */
  balanceDueMinor: number;
  currency: string;
  timeline: OwnerTimelineEntry[];
}

/** `GET /api/owner/approval/:tag/:token`. */
export interface OwnerApprovalView {
  tag: string;
  clubName: string;
  makeModel: string;
  state: TicketState;
  reflashConsent: boolean;
  quote: Quote;
  /** The findings of the diagnosis that the quote is for (the owner's decision rests on it). */
  decision: DiagnosisDecision | null;
}
