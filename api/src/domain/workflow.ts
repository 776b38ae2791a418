// The repair workflow: lanes of the Bench board and the moves allowed between them.
// Plain TypeScript with no framework imports: the API enforces it, the client uses it to show
// which lanes a card may go to. Source: the product brief, section 3 (our own design).

export const STATES = ['intake', 'diagnosis', 'reflash', 'repair', 'bench_test', 'return', 'closed'] as const;
export type TicketState = (typeof STATES)[number];

/** Lanes shown on the Bench board, in board order (closed tickets leave the board). */
export const BOARD_LANES: readonly TicketState[] = ['intake', 'diagnosis', 'reflash', 'repair', 'bench_test', 'return'];

export const STATE_LABELS: Record<TicketState, string> = {
  intake: 'Intake',
  diagnosis: 'Diagnosis',
  reflash: 'Reflash',
  repair: 'Repair',
  bench_test: 'Bench test',
  return: 'Return',
  closed: 'Closed',
};

export const ALLOWED_MOVES: Record<TicketState, readonly TicketState[]> = {
  intake: ['diagnosis'],
  diagnosis: ['reflash', 'repair', 'return'],
  reflash: ['bench_test', 'repair'],
  repair: ['bench_test'],
  bench_test: ['return', 'repair'],
  return: ['closed'],
  closed: [],
};

export function isState(value: unknown): value is TicketState {
  return typeof value === 'string' && (STATES as readonly string[]).includes(value);
}

/** What the guards need to know about a ticket. Later features add facts (flash attempts, test sheets, fees). */
export interface MoveFacts {
  state: TicketState;
  reflashConsent: boolean;
  /** A flash attempt recorded as "verified running" (flash attempts arrive with the reflash feature). */
  hasVerifiedFlash: boolean;
  /** A passed test sheet (test sheets arrive with the bench-test feature). */
  hasPassedTestSheet: boolean;
  /** A failed test sheet. */
  hasFailedTestSheet: boolean;
  /** The returned-items checklist matches what was handed in, or each difference is explained (hand-back). */
  returnedItemsChecked: boolean;
  /** The ticket's balance is zero or waived by the treasurer (fees). */
  balanceSettled: boolean;
  /** A quote above the club's threshold waits for the owner. */
  awaitingApproval: boolean;
  /**
   * The lane the ticket came from: the from-state of its latest move that was not undone (null
   * before its first move). A technician may send the ticket back there, with a note.
   */
  previousState: TicketState | null;
}

/** Shortest note a move accepts where the workflow asks for one (after trimming). */
export const NOTE_MIN_LENGTH = 3;

/** Whether `note` is enough for a move that needs one. */
export function hasNote(note?: string | null): boolean {
  return typeof note === 'string' && note.trim().length >= NOTE_MIN_LENGTH;
}

/**
 * What a move needs before it can be made, decided from the facts alone (before anyone writes a
 * note): refused with the reason; allowed; or allowed once the mover writes a note, with `reason`
 * saying what the note must say. The board, the ticket page and the server all ask this one
 * function, so "this move needs a note" is decided in one place.
 */
export type MoveRequirement =
  | { allowed: false; reason: string }
  | { allowed: true; noteRequired: false }
  | { allowed: true; noteRequired: true; reason: string };

/** The result of checking a move with the note actually written; `noteRequired` marks a refusal that a note would lift. */
export type MoveCheck = { allowed: true } | { allowed: false; reason: string; noteRequired?: true };

const refuse = (reason: string): MoveRequirement => ({ allowed: false, reason });
const FREE: MoveRequirement = { allowed: true, noteRequired: false };
const needsNote = (reason: string): MoveRequirement => ({ allowed: true, noteRequired: true, reason });

/**
 * The lane a ticket may be sent back to, or null: the lane it came from (`previousState`), when
 * that is not already a move of the table (then the table's guard applies), never out of Closed
 * and never into it. A send-back always needs a note saying why (our own design, issue 7).
 */
export function sendBackTarget(facts: Pick<MoveFacts, 'state' | 'previousState'>): TicketState | null {
  const { state: from, previousState: to } = facts;
  if (to === null || from === 'closed' || to === 'closed' || to === from) return null;
  if (ALLOWED_MOVES[from].includes(to)) return null;
  return to;
}

/** Decides what moving a ticket from its state to `to` needs (see MoveRequirement). */
export function moveRequirement(facts: MoveFacts, to: TicketState): MoveRequirement {
  const from = facts.state;
  if (from === to) return refuse(`The ticket is already in ${STATE_LABELS[to]}.`);
  if (!ALLOWED_MOVES[from].includes(to)) {
    const back = sendBackTarget(facts);
    // Sending back is not held by a quote awaiting approval: it takes the work a step back, not on.
    if (back === to) return needsNote(`Say why it goes back to ${STATE_LABELS[to]} in the note.`);
    const options = ALLOWED_MOVES[from].map((s) => STATE_LABELS[s]).join(', ');
    const backText = back ? ` (or back to ${STATE_LABELS[back]}, with a note)` : '';
    return refuse(
      `A ticket cannot go from ${STATE_LABELS[from]} to ${STATE_LABELS[to]}.` +
        (options ? ` From ${STATE_LABELS[from]} it can go to: ${options}${backText}.` : ' Closed tickets stay closed.'),
    );
  }
  if (facts.awaitingApproval && to !== 'return') return refuse('The owner has not approved the quote yet.');
  switch (`${from}>${to}`) {
    case 'diagnosis>reflash':
      if (!facts.reflashConsent) {
        return refuse('The owner has not consented to a reflash (settings and memories may be lost). Record consent first.');
      }
      break;
    case 'diagnosis>return':
      return needsNote('Say why it goes back unrepaired (no fault found, unrepairable, owner declined) in the note.');
    case 'reflash>bench_test':
      if (!facts.hasVerifiedFlash) return refuse('No flash attempt is recorded as verified running yet.');
      break;
    case 'bench_test>return':
      if (!facts.hasPassedTestSheet) return refuse('The test sheet has not passed yet.');
      break;
    case 'bench_test>repair':
      if (!facts.hasFailedTestSheet) return needsNote('Say what failed on the bench in the note, or record a failed test sheet.');
      break;
    case 'return>closed':
      if (!facts.returnedItemsChecked) return refuse('The returned-items checklist is not done yet.');
      if (!facts.balanceSettled) return refuse('Fees are not settled yet (the balance must be zero or waived by the treasurer).');
      break;
  }
  return FREE;
}

/** Decides whether a ticket may move from its state to `to` with `note`, and if not, why (in words for the user). */
export function checkMove(facts: MoveFacts, to: TicketState, note?: string): MoveCheck {
  const need = moveRequirement(facts, to);
  if (!need.allowed) return { allowed: false, reason: need.reason };
  if (need.noteRequired && !hasNote(note)) return { allowed: false, reason: need.reason, noteRequired: true };
  return { allowed: true };
}
