// Mails that carry an owner link or a note for the owner: plain functions from facts to
// { subject, text } (tested in owner-mails.test.ts). Internal notes never reach these.
import type { MailContent } from '../outbox/outbox.service';

interface OwnerMailFacts {
  clubName: string;
  ownerName: string;
  makeModel: string;
  tag: string;
  /** The owner's status link (no account needed). */
  statusLink: string;
}

const signature = (clubName: string) => `Rigwright, the repair bench of ${clubName}`;

/** A quote above the club's threshold: the owner approves or declines through the approval link. */
export function quoteApprovalMail(facts: OwnerMailFacts & { total: string; lines: string[]; note: string | null; approvalLink: string; expiresDays: number }): MailContent {
  return {
    subject: `Quote for your ${facts.makeModel} (${facts.tag}): ${facts.total}, your approval needed`,
    text: [
      `Hello ${facts.ownerName},`,
      '',
      `The bench has looked at your ${facts.makeModel} (ticket ${facts.tag}). The work it needs comes to ${facts.total}:`,
      ...facts.lines.map((l) => `  - ${l}`),
      ...(facts.note ? ['', facts.note] : []),
      '',
      'Work stops until you approve or decline. No account is needed; open this link:',
      facts.approvalLink,
      `The link works once, for ${facts.expiresDays} days. If you decline, your equipment goes back to you unrepaired.`,
      '',
      `Follow the ticket here: ${facts.statusLink}`,
      '',
      signature(facts.clubName),
    ].join('\n'),
  };
}

/** A note the technician wrote for the owner. */
export function ownerNoteMail(facts: OwnerMailFacts & { text: string }): MailContent {
  return {
    subject: `A note about your ${facts.makeModel} (${facts.tag})`,
    text: [
      `Hello ${facts.ownerName},`,
      '',
      `The bench wrote a note about your ${facts.makeModel} (ticket ${facts.tag}):`,
      '',
      facts.text,
      '',
      `Follow the ticket here: ${facts.statusLink}`,
      '',
      signature(facts.clubName),
    ].join('\n'),
  };
}
