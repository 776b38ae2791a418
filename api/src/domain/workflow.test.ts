// Rules from the product brief, section 3 (our own design; no published source).
import { describe, it } from 'node:test';
import assert from 'node:assert/strict';
import fc from 'fast-check';
import { ALLOWED_MOVES, BOARD_LANES, checkMove, hasNote, isState, moveRequirement, NOTE_MIN_LENGTH, sendBackTarget, STATES, type MoveFacts, type TicketState } from './workflow';

/** Facts under which every guard is satisfied, so only the move itself is being judged. */
const easy = (state: TicketState): MoveFacts => ({
  state,
  reflashConsent: true,
  hasVerifiedFlash: true,
  hasPassedTestSheet: true,
  hasFailedTestSheet: true,
  returnedItemsChecked: true,
  balanceSettled: true,
  awaitingApproval: false,
  previousState: null,
});

const reasonOf = (facts: MoveFacts, to: TicketState, note?: string) => {
  const r = checkMove(facts, to, note);
  assert.equal(r.allowed, false, `expected ${facts.state} → ${to} to be refused`);
  return (r as { reason: string }).reason;
};

describe('the move table (brief §3)', () => {
  const expected: [TicketState, TicketState][] = [
    ['intake', 'diagnosis'],
    ['diagnosis', 'reflash'],
    ['diagnosis', 'repair'],
    ['diagnosis', 'return'],
    ['reflash', 'bench_test'],
    ['reflash', 'repair'],
    ['repair', 'bench_test'],
    ['bench_test', 'return'],
    ['bench_test', 'repair'],
    ['return', 'closed'],
  ];
  it('has exactly the allowed moves of the brief', () => {
    const actual = STATES.flatMap((from) => ALLOWED_MOVES[from].map((to) => [from, to] as [TicketState, TicketState]));
    assert.deepEqual(new Set(actual.map((m) => m.join('>'))), new Set(expected.map((m) => m.join('>'))));
  });
  for (const [from, to] of expected) {
    it(`allows ${from} → ${to} when its guard is met`, () => {
      assert.deepEqual(checkMove(easy(from), to, 'owner declined the quote'), { allowed: true });
    });
  }
  it('refuses every other pair with a reason naming both lanes, and the same lane as "already"', () => {
    for (const from of STATES) {
      for (const to of STATES) {
        if (ALLOWED_MOVES[from].includes(to)) continue;
        const reason = reasonOf(easy(from), to, 'a note');
        if (from === to) assert.match(reason, /already in/);
        else assert.match(reason, /cannot go from/);
      }
    }
  });
  it('says where a ticket can go instead, and that closed tickets stay closed', () => {
    assert.equal(reasonOf(easy('intake'), 'repair'), 'A ticket cannot go from Intake to Repair. From Intake it can go to: Diagnosis.');
    assert.match(reasonOf(easy('closed'), 'intake'), /Closed tickets stay closed\.$/);
    assert.match(reasonOf(easy('diagnosis'), 'bench_test'), /From Diagnosis it can go to: Reflash, Repair, Return\./);
  });
  it('board lanes are every state but closed, in order; isState knows them', () => {
    assert.deepEqual(BOARD_LANES, STATES.filter((s) => s !== 'closed'));
    assert.ok(isState('bench_test'));
    assert.ok(!isState('bench test'));
    assert.ok(!isState(3));
  });
});

describe('guards', () => {
  it('diagnosis → reflash needs the owner’s consent', () => {
    assert.match(reasonOf({ ...easy('diagnosis'), reflashConsent: false }, 'reflash'), /not consented to a reflash/);
    assert.deepEqual(checkMove({ ...easy('diagnosis'), reflashConsent: false }, 'repair'), { allowed: true });
  });
  it('diagnosis → return needs a note of 3+ characters saying why', () => {
    assert.match(reasonOf(easy('diagnosis'), 'return'), /Say why it goes back unrepaired/);
    assert.match(reasonOf(easy('diagnosis'), 'return', '  ok '), /Say why/);
    assert.deepEqual(checkMove(easy('diagnosis'), 'return', 'NFF'), { allowed: true });
  });
  it('reflash → bench test needs a flash attempt verified running; reflash → repair does not', () => {
    const f = { ...easy('reflash'), hasVerifiedFlash: false };
    assert.match(reasonOf(f, 'bench_test'), /verified running/);
    assert.deepEqual(checkMove(f, 'repair'), { allowed: true });
  });
  it('bench test → return needs a passed test sheet', () => {
    assert.match(reasonOf({ ...easy('bench_test'), hasPassedTestSheet: false }, 'return'), /test sheet has not passed/);
  });
  it('bench test → repair needs a failed test sheet or a note', () => {
    const f = { ...easy('bench_test'), hasFailedTestSheet: false };
    assert.match(reasonOf(f, 'repair'), /Say what failed on the bench/);
    assert.deepEqual(checkMove(f, 'repair', 'no output on 40 m'), { allowed: true });
    assert.deepEqual(checkMove(easy('bench_test'), 'repair'), { allowed: true });
  });
  it('return → closed needs fees settled and the checklist done', () => {
    assert.match(reasonOf({ ...easy('return'), returnedItemsChecked: false }, 'closed'), /returned-items checklist/);
    assert.match(reasonOf({ ...easy('return'), balanceSettled: false }, 'closed'), /Fees are not settled/);
  });
  it('a quote awaiting approval holds every move except going back to the owner', () => {
    const held = (s: TicketState) => ({ ...easy(s), awaitingApproval: true });
    assert.match(reasonOf(held('diagnosis'), 'repair'), /not approved the quote/);
    assert.match(reasonOf(held('diagnosis'), 'reflash'), /not approved the quote/);
    assert.match(reasonOf(held('repair'), 'bench_test'), /not approved the quote/);
    assert.deepEqual(checkMove(held('diagnosis'), 'return', 'owner declined'), { allowed: true });
    assert.deepEqual(checkMove(held('bench_test'), 'return'), { allowed: true });
  });
  it('moves with no guard (intake → diagnosis, repair → bench test) pass with every fact false', () => {
    const none = (s: TicketState): MoveFacts => ({
      state: s, reflashConsent: false, hasVerifiedFlash: false, hasPassedTestSheet: false,
      hasFailedTestSheet: false, returnedItemsChecked: false, balanceSettled: false, awaitingApproval: false, previousState: null,
    });
    assert.deepEqual(checkMove(none('intake'), 'diagnosis'), { allowed: true });
    assert.deepEqual(checkMove(none('repair'), 'bench_test'), { allowed: true });
  });
});


describe('which moves need a note (moveRequirement: one place for the board, the ticket page and the server)', () => {
  const none = (s: TicketState): MoveFacts => ({
    state: s, reflashConsent: false, hasVerifiedFlash: false, hasPassedTestSheet: false,
    hasFailedTestSheet: false, returnedItemsChecked: false, balanceSettled: false, awaitingApproval: false, previousState: null,
  });
  it('diagnosis → return always needs a note, saying why it goes back unrepaired', () => {
    const need = moveRequirement(easy('diagnosis'), 'return');
    assert.equal(need.allowed, true);
    assert.equal(need.allowed && need.noteRequired, true);
    assert.match((need as { reason: string }).reason, /Say why it goes back unrepaired/);
    // Even with a quote waiting: going back to the owner is allowed, with the note.
    assert.equal((moveRequirement({ ...easy('diagnosis'), awaitingApproval: true }, 'return') as { noteRequired?: boolean }).noteRequired, true);
  });
  it('bench test → repair needs a note only without a failed test sheet', () => {
    assert.deepEqual(moveRequirement(easy('bench_test'), 'repair'), { allowed: true, noteRequired: false });
    const need = moveRequirement({ ...easy('bench_test'), hasFailedTestSheet: false }, 'repair');
    assert.equal(need.allowed && need.noteRequired, true);
    assert.match((need as { reason: string }).reason, /Say what failed on the bench/);
  });
  it('every other allowed move needs no note; a refused move says why and does not ask for a note', () => {
    for (const from of STATES) {
      for (const to of ALLOWED_MOVES[from]) {
        if (`${from}>${to}` === 'diagnosis>return' || `${from}>${to}` === 'bench_test>repair') continue;
        assert.deepEqual(moveRequirement(easy(from), to), { allowed: true, noteRequired: false }, `${from} → ${to}`);
      }
    }
    assert.deepEqual(moveRequirement(none('diagnosis'), 'reflash'), {
      allowed: false,
      reason: 'The owner has not consented to a reflash (settings and memories may be lost). Record consent first.',
    });
    assert.equal(moveRequirement(none('intake'), 'return').allowed, false);
  });
  it(`a note counts from ${NOTE_MIN_LENGTH} characters after trimming; checkMove marks a refusal that a note would lift`, () => {
    assert.equal(NOTE_MIN_LENGTH, 3);
    assert.ok(!hasNote(undefined));
    assert.ok(!hasNote(null));
    assert.ok(!hasNote('  ok  '));
    assert.ok(hasNote('NFF'));
    assert.deepEqual(checkMove(easy('diagnosis'), 'return', ' ok '), {
      allowed: false,
      noteRequired: true,
      reason: 'Say why it goes back unrepaired (no fault found, unrepairable, owner declined) in the note.',
    });
    // A refusal that no note can lift carries no noteRequired mark.
    assert.equal('noteRequired' in checkMove(none('diagnosis'), 'reflash', 'a long note'), false);
  });
});

describe('sending a ticket back to the lane it came from (issue 7; our own design, no published source)', () => {
  const cameFrom = (state: TicketState, previousState: TicketState | null): MoveFacts => ({ ...easy(state), previousState });
  it('is allowed only to the previous lane, and always asks for a note saying why', () => {
    const need = moveRequirement(cameFrom('repair', 'diagnosis'), 'diagnosis');
    assert.deepEqual(need, { allowed: true, noteRequired: true, reason: 'Say why it goes back to Diagnosis in the note.' });
    assert.deepEqual(checkMove(cameFrom('repair', 'diagnosis'), 'diagnosis'), {
      allowed: false, noteRequired: true, reason: 'Say why it goes back to Diagnosis in the note.',
    });
    assert.deepEqual(checkMove(cameFrom('repair', 'diagnosis'), 'diagnosis', 'Supply ripple, not the PA: diagnose again'), { allowed: true });
    assert.deepEqual(checkMove(cameFrom('diagnosis', 'intake'), 'intake', 'Serial number missing'), { allowed: true });
    assert.deepEqual(checkMove(cameFrom('bench_test', 'reflash'), 'reflash', 'Wrong image for the display head'), { allowed: true });
    // Not to any other earlier lane.
    assert.match(reasonOf(cameFrom('repair', 'diagnosis'), 'intake', 'a long enough note'), /cannot go from Repair to Intake/);
    assert.match(reasonOf(cameFrom('bench_test', 'reflash'), 'diagnosis', 'a long enough note'), /cannot go from Bench test to Diagnosis/);
  });
  it('names the way back in the refusal of any other lane', () => {
    assert.equal(
      reasonOf(cameFrom('repair', 'diagnosis'), 'intake'),
      'A ticket cannot go from Repair to Intake. From Repair it can go to: Bench test (or back to Diagnosis, with a note).',
    );
  });
  it('never takes a ticket out of Closed, with or without a note', () => {
    for (const previous of STATES) {
      assert.equal(sendBackTarget({ state: 'closed', previousState: previous }), null);
      assert.match(reasonOf(cameFrom('closed', previous), previous, 'Owner came back: it still fails'), previous === 'closed' ? /already in/ : /Closed tickets stay closed/);
    }
  });
  it('is not a send-back when the table already allows the move: the table\'s guard applies', () => {
    // Bench test → Repair is in the table: a failed sheet or a note, as before.
    assert.equal(sendBackTarget(cameFrom('bench_test', 'repair')), null);
    assert.deepEqual(moveRequirement(cameFrom('bench_test', 'repair'), 'repair'), { allowed: true, noteRequired: false });
    assert.equal(sendBackTarget(cameFrom('intake', null)), null, 'no move yet: nowhere to go back to');
    assert.equal(sendBackTarget(cameFrom('repair', 'diagnosis')), 'diagnosis');
  });
  it('is not held by a quote awaiting approval (it takes the work back, not on)', () => {
    const held = { ...cameFrom('repair', 'diagnosis'), awaitingApproval: true };
    assert.deepEqual(checkMove(held, 'diagnosis', 'Quote needs redoing'), { allowed: true });
    assert.match(reasonOf(held, 'bench_test'), /not approved the quote/);
  });
});

describe('properties', () => {
  const state = fc.constantFrom(...STATES);
  const facts = fc.record({
    state,
    reflashConsent: fc.boolean(),
    hasVerifiedFlash: fc.boolean(),
    hasPassedTestSheet: fc.boolean(),
    hasFailedTestSheet: fc.boolean(),
    returnedItemsChecked: fc.boolean(),
    balanceSettled: fc.boolean(),
    awaitingApproval: fc.boolean(),
    previousState: fc.option(state, { nil: null }),
  });
  it('no fact ever allows a move outside the table other than back to the previous lane, and every refusal has a reason', () => {
    fc.assert(
      fc.property(facts, state, fc.option(fc.string({ maxLength: 12 }), { nil: undefined }), (f, to, note) => {
        const r = checkMove(f, to, note);
        if (r.allowed) {
          const inTable = ALLOWED_MOVES[f.state].includes(to);
          // Outside the table only a send-back: to the previous lane, never out of Closed, with a note.
          assert.ok(inTable || (to === f.previousState && f.state !== 'closed' && hasNote(note)), `${f.state} → ${to}`);
        } else assert.ok(r.reason.length > 10);
        // checkMove is moveRequirement plus the note: allowed exactly when the requirement allows
        // it and, where it asks for a note, the note is there.
        const need = moveRequirement(f, to);
        assert.equal(r.allowed, need.allowed && (!need.noteRequired || hasNote(note)));
      }),
      { numRuns: 2000 },
    );
  });
  it('nothing leaves Closed, and a send-back always needs a note', () => {
    fc.assert(
      fc.property(facts, state, fc.option(fc.string({ maxLength: 40 }), { nil: undefined }), (f, to, note) => {
        if (f.state === 'closed') assert.equal(checkMove(f, to, note).allowed, false);
        if (!ALLOWED_MOVES[f.state].includes(to) && to !== f.state) {
          const need = moveRequirement(f, to);
          if (need.allowed) {
            assert.equal(to, f.previousState);
            assert.equal(need.noteRequired, true);
            assert.equal(sendBackTarget(f), to);
          }
        }
      }),
      { numRuns: 2000 },
    );
  });
});
