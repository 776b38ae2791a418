// The mails a ticket sends its owner: plain functions from facts to { subject, text }, so the
// wording lives in one place and is tested without a database (ticket-mails.test.ts). The club's
// name comes from the club settings (club/club-settings.service.ts), never from the code.
import type { MailContent } from '../outbox/outbox.service';

export interface TicketMailFacts {
  clubName: string;
  ownerName: string;
  makeModel: string;
  /** The tag the owner quotes, e.g. RW-0042. */
  tag: string;
  /** Where the owner follows the ticket. */
  link: string;
  /** The owner's status link (no account needed; modules/owner-links), when one was issued. */
  statusLink?: string;
}

/** The lines that tell the owner where to follow the ticket. */
function followLines(facts: TicketMailFacts): string[] {
  if (!facts.statusLink) return [`Follow it here: ${facts.link}`];
  return [`Follow it here, no account needed: ${facts.statusLink}`, `Members can also sign in: ${facts.link}`];
}

function signature(clubName: string): string {
  return `Rigwright, the repair bench of ${clubName}`;
}

export interface IntakeMailFacts {
  faultReported: string;
  /** Labels of the ticked symptoms. */
  symptoms: string[];
  serialNumber: string | null;
  units: string[];
  accessories: string[];
  accessoriesNote: string | null;
}

/** Sent when equipment is handed in (the owner asked for e-mail): what the bench holds, for the owner to check. */
export function ticketOpenedMail(facts: TicketMailFacts & IntakeMailFacts): MailContent {
  const { tag } = facts;
  const handedIn = facts.accessories.length ? facts.accessories.join(', ') : 'nothing besides the equipment';
  return {
    subject: `Ticket ${tag} opened`,
    text: [
      `Hello ${facts.ownerName},`,
      '',
      `Your ${facts.makeModel} has been handed in at the bench as ticket ${tag}.`,
      '',
      `Equipment: ${facts.makeModel}${facts.units.length ? ` (${facts.units.join(', ')})` : ''}`,
      `Serial number: ${facts.serialNumber ?? 'not recorded'}`,
      `Accessories handed in: ${handedIn}`,
      ...(facts.accessoriesNote ? [`About the accessories: ${facts.accessoriesNote}`] : []),
      ...(facts.symptoms.length ? [`Symptoms: ${facts.symptoms.join('; ')}`] : []),
      `Fault as reported: ${facts.faultReported}`,
      '',
      'If anything above is wrong or missing, tell the bench when you quote the tag number.',
      `Quote ${tag} when you ask about it. You will get an e-mail each time it moves on.`,
      ...followLines(facts),
      '',
      signature(facts.clubName),
    ].join('\n'),
  };
}

/** Sent on each move between lanes; `from` and `to` are the lanes' labels as the board shows them. */
export function ticketMovedMail(facts: TicketMailFacts & { from: string; to: string }): MailContent {
  return {
    subject: `Your ${facts.makeModel} (${facts.tag}) has moved to ${facts.to}`,
    text: [
      `Hello ${facts.ownerName},`,
      '',
      `Your ${facts.makeModel} (ticket ${facts.tag}) has moved from ${facts.from} to ${facts.to}.`,
      ...followLines(facts),
      '',
      signature(facts.clubName),
    ].join('\n'),
  };
}
