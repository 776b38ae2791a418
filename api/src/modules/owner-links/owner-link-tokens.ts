// Issuing and finding owner links. A token is 32 random bytes (256 bits, base64url: 43 characters);
// the database keeps only its SHA-256, so a copy of the database opens no ticket. A changed
// character gives another hash that matches no row: the link is refused as "not valid".
// OWASP Forgot Password Cheat Sheet (random, single-use, stored hashed, expiring tokens) applied
// to the owner's links.
import { createHash, randomBytes } from 'node:crypto';
import type { Transaction } from 'sequelize';
import type { Config } from '../../config';
import { AppError, NotFoundError } from '../../errors';
import { OwnerLink, type OwnerLinkPurpose } from './owner-link.model';
import { Ticket } from '../tickets/ticket.model';
import { parseTag } from '../tickets/tag';

/** An approval link works this long after the quote mail (a new quote sends a new one). */
export const APPROVAL_LINK_DAYS = 30;
/** A status link stops working this long after the ticket was closed (issue 7: "closed for a while"). */
export const STATUS_LINK_DAYS_AFTER_CLOSE = 30;
const DAY_MS = 24 * 60 * 60 * 1000;

export const TOKEN_PATTERN = /^[A-Za-z0-9_-]{43}$/;

export function hashToken(token: string): string {
  return createHash('sha256').update(token, 'utf8').digest('hex');
}

/** Creates a link row in the caller's transaction and returns the token (to be mailed, never stored). */
export async function issueOwnerLink(
  transaction: Transaction,
  link: { purpose: OwnerLinkPurpose; ticketId: number; quoteId?: number | null },
  now: Date,
): Promise<string> {
  const token = randomBytes(32).toString('base64url');
  await OwnerLink.create(
    {
      tokenHash: hashToken(token),
      purpose: link.purpose,
      ticketId: link.ticketId,
      quoteId: link.quoteId ?? null,
      expiresAt: link.purpose === 'approve' ? new Date(now.getTime() + APPROVAL_LINK_DAYS * DAY_MS) : null,
      usedAt: null,
      createdAt: now,
    },
    { transaction },
  );
  return token;
}

/** The address the owner opens: the public page of the client. */
export function ownerLinkUrl(config: Pick<Config, 'RW_PUBLIC_URL'>, purpose: OwnerLinkPurpose, tag: string, token: string): string {
  const base = config.RW_PUBLIC_URL.replace(/\/$/, '');
  return `${base}/owner/${purpose === 'approve' ? 'approve' : 'status'}/${tag}/${token}`;
}

/** A status link for a ticket's mail (a fresh token per mail; each works until the ticket has been closed a while). */
export async function statusLinkFor(config: Pick<Config, 'RW_PUBLIC_URL'>, transaction: Transaction, ticketId: number, tag: string, now: Date): Promise<string> {
  return ownerLinkUrl(config, 'status', tag, await issueOwnerLink(transaction, { purpose: 'status', ticketId }, now));
}

export const LINK_NOT_VALID =
  'This link is not valid. Check that you opened the whole link from the e-mail; if it still fails, ask the bench for a new one.';

/**
 * The link and its ticket for a token from the address bar, or a refusal in plain words:
 * 404 for a token that matches nothing, a link of another purpose or one for another ticket
 * (all alike, so a guess learns nothing); 410 once the ticket has been closed too long or the
 * link has expired.
 */
export async function openOwnerLink(
  input: { tag: string; token: string; purpose: OwnerLinkPurpose },
  now: Date,
  transaction?: Transaction,
): Promise<{ link: OwnerLink; ticket: Ticket }> {
  const ticketId = parseTag(input.tag);
  if (!ticketId || !TOKEN_PATTERN.test(input.token)) throw new NotFoundError(LINK_NOT_VALID, 'owner_link_not_valid');
  const link = await OwnerLink.findOne({
    where: { tokenHash: hashToken(input.token) },
    transaction,
    ...(transaction ? { lock: transaction.LOCK.UPDATE } : {}),
  });
  if (!link || link.purpose !== input.purpose || link.ticketId !== ticketId) throw new NotFoundError(LINK_NOT_VALID, 'owner_link_not_valid');
  const ticket = await Ticket.findByPk(ticketId, { transaction, ...(transaction ? { lock: transaction.LOCK.UPDATE } : {}) });
  if (!ticket) throw new NotFoundError(LINK_NOT_VALID, 'owner_link_not_valid');
  if (link.expiresAt && link.expiresAt.getTime() <= now.getTime()) {
    throw new AppError(410, 'owner_link_expired', 'This link has expired. Ask the bench to send you a new one.');
  }
  if (ticket.state === 'closed') {
    const closedFor = now.getTime() - new Date(ticket.stateSince).getTime();
    if (input.purpose === 'approve') {
      throw new AppError(410, 'ticket_closed', 'This ticket is closed, so there is nothing left to approve. Ask the bench if you have questions.');
    }
    if (closedFor > STATUS_LINK_DAYS_AFTER_CLOSE * DAY_MS) {
      throw new AppError(
        410,
        'owner_link_expired',
        `This ticket was closed more than ${STATUS_LINK_DAYS_AFTER_CLOSE} days ago, so its status link no longer works. Ask the bench if you need its record.`,
      );
    }
  }
  return { link, ticket };
}
