import { ALLOWED_MOVES, MoveRequirement, TicketState, moveRequirement, sendBackTarget } from '@domain/workflow';
import { Card } from './board.models';

/**
 * What the board can decide about a move from a card alone, asked of the workflow itself
 * (`moveRequirement`, the same function the server uses). A card carries some facts (its flags);
 * guards that need more (consent, flash attempts, test sheets, fees) are assumed met here and
 * left to the server, which answers 422 with its reason.
 */
export function cardMoveRequirement(card: Card, to: TicketState): MoveRequirement {
  return moveRequirement(
    {
      state: card.state,
      awaitingApproval: card.flags.includes('awaiting_approval'),
      previousState: card.previousState ?? null,
      hasFailedTestSheet: card.flags.includes('test_failed'),
      // Unknown to the board: assume yes and let the server decide.
      reflashConsent: true,
      hasVerifiedFlash: true,
      hasPassedTestSheet: true,
      returnedItemsChecked: true,
      balanceSettled: true,
    },
    to,
  );
}

export function movesFrom(state: TicketState): readonly TicketState[] {
  return ALLOWED_MOVES[state] ?? [];
}

/** The lane the card can be sent back to (where it came from, with a note), or null. */
export function sendBackOf(card: Card): TicketState | null {
  return sendBackTarget({ state: card.state, previousState: card.previousState ?? null });
}
