// Queues an e-mail as an outbox row inside the caller's transaction: the mail exists if and only
// if the change that caused it commits. The outbox worker sends it later, with retries.
import type { Transaction } from 'sequelize';
import { Outbox } from './outbox.model';

export interface MailToQueue {
  /** What the mail is about, e.g. 'ticket_opened', 'ticket_moved', 'password_reset'. */
  kind: string;
  to: string;
  subject: string;
  text: string;
  ticketId?: number | null;
  bookingId?: number | null;
  /** Hold the mail until this instant (the worker skips it before then). */
  sendAfter?: Date | null;
}

/** Writes one pending outbox row in `transaction` and returns its id. */
export async function enqueueMail(transaction: Transaction, mail: MailToQueue): Promise<number> {
  const row = await Outbox.create(
    {
      kind: mail.kind,
      toAddress: mail.to,
      subject: mail.subject.slice(0, 200),
      textBody: mail.text,
      ticketId: mail.ticketId ?? null,
      bookingId: mail.bookingId ?? null,
      sendAfter: mail.sendAfter ?? null,
      nextAttemptAt: mail.sendAfter ?? new Date(),
      lockedUntil: null,
      lastError: null,
      sentAt: null,
    },
    { transaction },
  );
  return row.id;
}
