// Queues an e-mail as an outbox row inside the caller's transaction: the mail exists if and only
// if the change that caused it commits. The outbox worker sends it later, with retries.
import type { Transaction } from 'sequelize';
import { Outbox } from './outbox.model';

/** What a mail template returns (tickets/ticket-mails.ts, auth/auth-mails.ts). */
export interface MailContent {
  subject: string;
  text: string;
}

export interface MailToQueue extends MailContent {
  /** What the mail is about, e.g. 'ticket_opened', 'ticket_moved', 'password_reset'. */
  kind: string;
  to: string;
  ticketId?: number | null;
  bookingId?: number | null;
  /** Hold the mail until this instant (the worker skips it before then). */
  sendAfter?: Date | null;
  /** One file sent with the mail (e.g. a test report PDF), stored in the outbox row. */
  attachment?: MailAttachment | null;
  /** Pending mails with the same key replace each other (see modules/moves/move-mail.ts). */
  coalesceKey?: string | null;
  /** What the recipient was last told before this mail, for the next mail with the same key. */
  coalesceBase?: string | null;
}

export interface MailAttachment {
  name: string;
  contentType: string;
  content: Buffer;
}

/** Writes one pending outbox row in `transaction`, due at `now` (the caller's clock), and returns its id. */
export async function enqueueMail(transaction: Transaction, mail: MailToQueue, now: Date = new Date()): Promise<number> {
  const row = await Outbox.create(
    {
      kind: mail.kind,
      toAddress: mail.to,
      subject: mail.subject.slice(0, 200),
      textBody: mail.text,
      ticketId: mail.ticketId ?? null,
      bookingId: mail.bookingId ?? null,
      sendAfter: mail.sendAfter ?? null,
      attachmentName: mail.attachment?.name ?? null,
      attachmentType: mail.attachment?.contentType ?? null,
      attachmentContent: mail.attachment?.content ?? null,
      coalesceKey: mail.coalesceKey ?? null,
      coalesceBase: mail.coalesceBase ?? null,
      nextAttemptAt: mail.sendAfter ?? now,
      createdAt: now,
      lockedUntil: null,
      lastError: null,
      sentAt: null,
    },
    { transaction },
  );
  return row.id;
}
