// Sends queued mail from the outbox table, with retries and exponential back-off.
//
// Claiming: a short transaction picks due rows with SELECT ... FOR UPDATE SKIP LOCKED and sets
// locked_until (a lease), so two workers (two API replicas, or a separate worker process) never
// pick the same row. Each mail carries Message-ID <outbox-<id>@rigwright.local>: if a worker dies
// after the mail server accepted a mail but before the row is marked sent, the retry is
// recognisable as the same message. The SMTP timeouts are well inside the lease, so a lease can
// only expire on a worker that has stopped.
import { isIP } from 'node:net';
import nodemailer, { type Transporter } from 'nodemailer';
import type Mail from 'nodemailer/lib/mailer';
import { QueryTypes, Transaction, literal } from 'sequelize';
import type { Config } from '../../config';
import type { AppDeps } from '../../deps';
import { readClubName } from '../club/club-settings.service';
import { Outbox } from './outbox.model';

export interface OutboxWorkerOptions {
  /** Milliseconds between sweeps; 0 runs no timer (call runOnce yourself). Default: RW_OUTBOX_INTERVAL_MS. */
  intervalMs?: number;
  /** Rows claimed per sweep. */
  batchSize?: number;
  /** How long a claim holds a row. */
  leaseMs?: number;
  /** First retry delay; it doubles per failed attempt up to maxDelayMs. */
  baseDelayMs?: number;
  maxDelayMs?: number;
  /** After this many failed attempts the row is marked 'failed' (shown to admins). */
  maxAttempts?: number;
  /** SMTP connection, greeting and socket timeouts. */
  smtpTimeoutMs?: number;
}

/** Its clock decides when a mail is due and when a retry may come (tests move it instead of waiting). */
export type OutboxWorkerDeps = Pick<AppDeps, 'config' | 'sequelize' | 'logger' | 'clock'>;

export interface OutboxWorker {
  /** Stops the timer, waits for a sweep in progress, closes the SMTP transport. */
  stop(): Promise<void>;
  /** One sweep: claims due rows and tries each once. Resolves to the number of mails sent. */
  runOnce(): Promise<number>;
}

export const OUTBOX_DEFAULTS: Required<Omit<OutboxWorkerOptions, 'intervalMs'>> = {
  batchSize: 20,
  leaseMs: 120_000,
  baseDelayMs: 2_000,
  maxDelayMs: 300_000,
  maxAttempts: 20,
  smtpTimeoutMs: 20_000,
};

/** Delay before the next try after `attempts` failed attempts: base, 2×base, 4×base, ... capped. */
export function retryDelayMs(attempts: number, baseDelayMs: number, maxDelayMs: number): number {
  const exponent = Math.max(0, Math.min(attempts - 1, 30));
  return Math.min(baseDelayMs * 2 ** exponent, maxDelayMs);
}

export function outboxMessageId(id: number | string): string {
  return `<outbox-${id}@rigwright.local>`;
}

/**
 * The sender of every mail: RW_MAIL_FROM when it is set, otherwise "<club name> repair bench" (the
 * club's name from the club settings) at bench@ the host of RW_PUBLIC_URL (bench@localhost when
 * that is an IP address or a name without a dot).
 */
export function mailSender(config: Pick<Config, 'RW_MAIL_FROM' | 'RW_PUBLIC_URL'>, clubName: string): string | Mail.Address {
  if (config.RW_MAIL_FROM) return config.RW_MAIL_FROM;
  const host = new URL(config.RW_PUBLIC_URL).hostname;
  const domain = host.includes('.') && !isIP(host.replace(/^\[|\]$/g, '')) ? host : 'localhost';
  return { name: `${clubName} repair bench`, address: `bench@${domain}` };
}

/** What is kept of an SMTP failure: code and message, one line, no credentials or addresses' bodies. */
function describeError(err: unknown): string {
  const e = err as { code?: string; responseCode?: number; message?: string };
  const text = `${e?.code ?? 'Error'}${e?.responseCode ? ` ${e.responseCode}` : ''}: ${e?.message ?? String(err)}`;
  return text.replace(/[\r\n]+/g, ' ').slice(0, 500);
}

type ClaimedRow = {
  id: number | string;
  to_address: string;
  subject: string;
  text_body: string;
  attempts: number;
  attachment_name: string | null;
  attachment_type: string | null;
  attachment_content: Buffer | null;
};

export function startOutboxWorker(deps: OutboxWorkerDeps, options: OutboxWorkerOptions = {}): OutboxWorker {
  const { config, sequelize, logger, clock } = deps;
  const opts = { ...OUTBOX_DEFAULTS, ...options };
  const intervalMs = options.intervalMs ?? config.RW_OUTBOX_INTERVAL_MS;
  const log = logger.child({ component: 'outbox' });

  const transport: Transporter = nodemailer.createTransport({
    host: config.RW_SMTP_HOST,
    port: config.RW_SMTP_PORT,
    secure: false,
    connectionTimeout: opts.smtpTimeoutMs,
    greetingTimeout: opts.smtpTimeoutMs,
    socketTimeout: opts.smtpTimeoutMs,
  });

  async function claim(): Promise<ClaimedRow[]> {
    try {
      return await claimOnce();
    } catch (err) {
      // Two workers racing for the same index range may still deadlock; InnoDB rolls one back.
      // That worker simply claims nothing this round; the rows stay pending for the next sweep.
      if ((err as { parent?: { errno?: number } }).parent?.errno === 1213) {
        log.debug('outbox claim lost a deadlock; retrying next sweep');
        return [];
      }
      throw err;
    }
  }

  async function claimOnce(): Promise<ClaimedRow[]> {
    // Raw SQL on purpose: the claim needs FOR UPDATE SKIP LOCKED, which Sequelize's finders do not
    // offer on MariaDB, and it is the step that two workers race on (see the two-replica test).
    // READ COMMITTED: no gap locks, so SKIP LOCKED lets concurrent claimers take disjoint rows.
    return sequelize.transaction({ isolationLevel: Transaction.ISOLATION_LEVELS.READ_COMMITTED }, async (transaction) => {
      const now = clock();
      const due = await sequelize.query<{ id: number | string }>(
        "SELECT id FROM outbox WHERE status = 'pending' AND next_attempt_at <= :now AND (send_after IS NULL OR send_after <= :now) " +
          'AND (locked_until IS NULL OR locked_until < :now) ORDER BY next_attempt_at, id LIMIT :limit FOR UPDATE SKIP LOCKED',
        { replacements: { now, limit: opts.batchSize }, type: QueryTypes.SELECT, transaction },
      );
      if (due.length === 0) return [];
      const ids = due.map((r) => r.id);
      await sequelize.query('UPDATE outbox SET locked_until = :until WHERE id IN (:ids)', {
        replacements: { until: new Date(now.getTime() + opts.leaseMs), ids },
        transaction,
      });
      return sequelize.query<ClaimedRow>(
        'SELECT id, to_address, subject, text_body, attempts, attachment_name, attachment_type, attachment_content FROM outbox WHERE id IN (:ids) ORDER BY id',
        { replacements: { ids }, type: QueryTypes.SELECT, transaction },
      );
    });
  }

  async function deliver(row: ClaimedRow, from: string | Mail.Address): Promise<boolean> {
    try {
      await transport.sendMail({
        from,
        to: row.to_address,
        subject: row.subject,
        text: row.text_body,
        messageId: outboxMessageId(row.id),
        attachments: row.attachment_content
          ? [{ filename: row.attachment_name ?? 'attachment', contentType: row.attachment_type ?? 'application/octet-stream', content: Buffer.from(row.attachment_content) }]
          : undefined,
      });
    } catch (err) {
      const attempts = row.attempts + 1;
      const failed = attempts >= opts.maxAttempts;
      const next = new Date(clock().getTime() + retryDelayMs(attempts, opts.baseDelayMs, opts.maxDelayMs));
      await Outbox.update(
        { attempts, status: failed ? 'failed' : 'pending', nextAttemptAt: next, lockedUntil: null, lastError: describeError(err) },
        { where: { id: row.id } },
      );
      log[failed ? 'error' : 'warn']({ outboxId: Number(row.id), attempts, failed, error: describeError(err) }, 'mail not sent');
      return false;
    }
    await Outbox.update(
      { status: 'sent', sentAt: clock(), attempts: literal('attempts + 1'), lockedUntil: null, lastError: null },
      { where: { id: row.id } },
    );
    log.info({ outboxId: Number(row.id) }, 'mail sent');
    return true;
  }

  let running: Promise<number> | null = null;
  let stopped = false;
  let timer: NodeJS.Timeout | undefined;

  async function sweep(): Promise<number> {
    const rows = await claim();
    if (rows.length === 0) return 0;
    // Read per sweep, so a change of the club's name shows in the next mail without a restart.
    const from = mailSender(config, await readClubName());
    let sent = 0;
    // One at a time: a club's mail volume is small and the server sees one connection per mail.
    for (const row of rows) if (await deliver(row, from)) sent++;
    return sent;
  }

  function runOnce(): Promise<number> {
    // Sweeps never overlap within one worker; other workers are kept apart by the claim.
    if (!running) running = sweep().finally(() => (running = null));
    return running;
  }

  function schedule(delay: number) {
    if (stopped || intervalMs <= 0) return;
    timer = setTimeout(async () => {
      try {
        await runOnce();
      } catch (err) {
        log.error({ err }, 'outbox sweep failed');
      }
      schedule(intervalMs);
    }, delay);
    timer.unref?.();
  }
  schedule(intervalMs);

  return {
    runOnce,
    async stop() {
      stopped = true;
      if (timer) clearTimeout(timer);
      await running?.catch(() => 0);
      transport.close();
    },
  };
}
