// The outbox worker: sends due rows over SMTP with nodemailer, one row per transaction. The row is claimed with
// SELECT … FOR UPDATE SKIP LOCKED and stays locked until it is marked sent, so several server instances can
// drain the same outbox side by side and no row is sent by two of them.
import { QueryTypes, type Sequelize } from 'sequelize';
import type { Transporter } from 'nodemailer';
import { retryDelayMs, type MailKind } from '../../../shared/domain/notifications.js';
import { logger } from '../../lib/logger.js';
import type { OutboxAttachment } from './mail.model.js';
import { outboxQueued } from './outbox.signal.js';

interface DueRow {
  id: string;
  kind: MailKind;
  to_address: string;
  subject: string;
  text_body: string;
  html_body: string;
  attachments: OutboxAttachment[];
  attempts: number;
}

export interface OutboxWorkerOptions {
  sequelize: Sequelize;
  transport: Pick<Transporter, 'sendMail'>;
  /** The From header, e.g. `Skewbench <skewbench@lab.test>`. */
  from: string;
  /** Host part of Message-IDs: `<outbox-42@host>`, the same on every retry, so a receiver can drop repeats. */
  messageIdHost: string;
  /** How often to look for due rows when nothing wakes the worker, ms. */
  pollMs?: number;
  now?: () => Date;
  /** Asked between rows: true ends the pass early (the server is stopping). */
  stopping?: () => boolean;
}

/**
 * A refusal of this message itself (RFC 5321 §4.2.2, §4.2.3): 550 mailbox unavailable, 551 user not local,
 * 552 too big, 553 mailbox name not allowed, 554 transaction failed. Retrying would give the same answer, so the
 * row is marked failed for a manager to look at. Everything else is retried with backoff, for as long as it
 * takes: no connection, a time-out, 4xx (try later), and the 5xx answers that mean the relay or our settings are
 * wrong (500–504 syntax, 530/535 authentication), which a fixed SMTP_URL cures without losing the queue.
 */
function isRefusalOfMessage(err: unknown): boolean {
  const code = (err as { responseCode?: number }).responseCode;
  return typeof code === 'number' && code >= 550 && code <= 554;
}

/** Kinds whose text holds a one-time link: once sent, the stored copy is cut, so the database holds no live link. */
const SECRET_KINDS = new Set<MailKind>(['invitation', 'password-reset']);
const REMOVED = '(Removed after sending: this message held a one-time link.)';

function describe(err: unknown): string {
  const e = err as { code?: string; responseCode?: number; message?: string };
  return [e.code, e.responseCode, e.message].filter((x) => x !== undefined && x !== '').join(' ').slice(0, 500);
}

export interface DrainResult {
  sent: number;
  retried: number;
  failed: number;
}

/**
 * Send every due row, one transaction each, until none is left or the SMTP server stops answering (then the
 * rest waits for the next pass). Returns what happened.
 */
export async function drainOutbox(options: OutboxWorkerOptions): Promise<DrainResult> {
  const { sequelize, transport, from, messageIdHost } = options;
  const now = options.now ?? (() => new Date());
  const result: DrainResult = { sent: 0, retried: 0, failed: 0 };
  for (;;) {
    const outcome = await sequelize.transaction(async (transaction) => {
      const [row] = await sequelize.query<DueRow>(
        `SELECT id, kind, to_address, subject, text_body, html_body, attachments, attempts FROM outbox
          WHERE status = 'pending' AND next_attempt_at <= :now
          ORDER BY next_attempt_at, id LIMIT 1 FOR UPDATE SKIP LOCKED`,
        { replacements: { now: now() }, type: QueryTypes.SELECT, transaction },
      );
      if (!row) return 'empty' as const;
      const messageId = `<outbox-${row.id}@${messageIdHost}>`;
      try {
        await transport.sendMail({
          from,
          to: row.to_address,
          subject: row.subject,
          text: row.text_body,
          html: row.html_body,
          messageId,
          attachments: row.attachments.map((a) => ({ filename: a.filename, contentType: a.contentType, content: Buffer.from(a.content, 'base64') })),
        });
      } catch (err) {
        const attempts = row.attempts + 1;
        const giveUp = isRefusalOfMessage(err);
        await sequelize.query(
          `UPDATE outbox SET attempts = :attempts, last_error = :error, status = :status, next_attempt_at = :next WHERE id = :id`,
          {
            replacements: { id: row.id, attempts, error: describe(err), status: giveUp ? 'failed' : 'pending', next: new Date(now().getTime() + retryDelayMs(attempts)) },
            transaction,
          },
        );
        if (giveUp) logger.warn(`mail ${row.id} to ${row.to_address} failed for good: ${describe(err)}`);
        return giveUp ? ('failed' as const) : ('retry' as const);
      }
      const secret = SECRET_KINDS.has(row.kind);
      await sequelize.query(
        `UPDATE outbox SET status = 'sent', sent_at = :now, attempts = attempts + 1, message_id = :messageId, last_error = NULL
                ${secret ? `, text_body = :removed, html_body = :removed` : ''}
          WHERE id = :id`,
        { replacements: { id: row.id, now: now(), messageId, removed: REMOVED }, transaction },
      );
      return 'sent' as const;
    });
    if (outcome === 'empty' || options.stopping?.()) return result;
    if (outcome === 'sent') result.sent += 1;
    else if (outcome === 'failed') result.failed += 1;
    else {
      // The server is unreachable or busy: stop this pass; the row's backoff decides when it is tried again.
      result.retried += 1;
      return result;
    }
  }
}

export interface OutboxWorker {
  /** Run a pass now (or right after the running one) and resolve when it is done. */
  kick(): Promise<void>;
  stop(): Promise<void>;
}

/** Drain the outbox every `pollMs` and whenever this process queues mail; passes never overlap. */
export function startOutboxWorker(options: OutboxWorkerOptions): OutboxWorker {
  let running: Promise<void> | null = null;
  let again = false;
  let stopped = false;
  const pass = (): Promise<void> => {
    if (running) {
      again = true;
      return running;
    }
    running = (async () => {
      do {
        again = false;
        try {
          const r = await drainOutbox({ ...options, stopping: () => stopped });
          if (r.retried) logger.warn('mail server not reachable or busy; queued mail will be retried');
        } catch (err) {
          logger.warn(`outbox pass failed: ${(err as Error).message}`);
        }
      } while (again && !stopped);
      running = null;
    })();
    return running;
  };
  const onQueued = () => void pass();
  outboxQueued.on('queued', onQueued);
  const timer = setInterval(() => void pass(), options.pollMs ?? 5_000);
  timer.unref();
  void pass();
  return {
    kick: pass,
    async stop() {
      stopped = true;
      clearInterval(timer);
      outboxQueued.off('queued', onQueued);
      await running;
    },
  };
}
