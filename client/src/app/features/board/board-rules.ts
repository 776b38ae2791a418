import { ALLOWED_MOVES, MoveCheck, STATE_LABELS, TicketState, checkMove } from '@domain/workflow';
import { Card } from './board.models';

/**
 * What the board can decide about a move from a card alone. It knows the lane rules and the
 * facts a card carries (flags); guards that need more facts (consent, flash attempts, test sheets,
 * fees) are left to the server, which answers 422 with its reason.
 */
export function checkCardMove(card: Card, to: TicketState, note?: string): MoveCheck {
  return checkMove(
    {
      state: card.state,
      awaitingApproval: card.flags.includes('awaiting_approval'),
      hasFailedTestSheet: card.flags.includes('test_failed'),
      // Unknown to the board: assume yes and let the server decide.
      reflashConsent: true,
      hasVerifiedFlash: true,
      hasPassedTestSheet: true,
      readyToClose: true,
    },
    to,
    note,
  );
}

/** Moves that need a note for the timeline before the server accepts them. */
export function moveNeedsNote(card: Card, to: TicketState): boolean {
  if (card.state === 'diagnosis' && to === 'return') return true;
  if (card.state === 'bench_test' && to === 'repair') return !card.flags.includes('test_failed');
  return false;
}

export function movesFrom(state: TicketState): readonly TicketState[] {
  return ALLOWED_MOVES[state] ?? [];
}

export function notePrompt(card: Card, to: TicketState): string {
  return card.state === 'diagnosis'
    ? `Say why ${card.tag} goes back to the owner unrepaired: no fault found, unrepairable, or owner declined.`
    : `Say what failed on the bench before ${card.tag} goes back to ${STATE_LABELS[to]}.`;
}
