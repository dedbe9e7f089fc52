import { QueryTypes } from 'sequelize';
import type { CapturedMail, CapturedMailSummary, MailboxQuery, OutboxEntry, OutboxQuery } from '../../../shared/schemas/mail.js';
import { notFound } from '../../lib/errors.js';
import { OutboxModel } from './mail.model.js';
import { outboxQueued } from './outbox.signal.js';
import { isoUtcSql } from '../../lib/sql.js';

const db = () => OutboxModel.sequelize!;
const iso = isoUtcSql;

const summaryColumns = `m.id::int AS id, array_to_string(m.envelope_to, ', ') AS "to", m.envelope_to AS "toAddresses",
  m.to_header AS "toHeader", m.from_header AS "from", m.subject, ${iso('m.received_at')} AS "receivedAt", m.message_id AS "messageId",
  m.size_bytes AS "sizeBytes", m.html_body IS NOT NULL AS "hasHtml",
  (SELECT coalesce(json_agg(json_build_object('index', a.ordinality - 1, 'filename', a.value ->> 'filename',
            'contentType', a.value ->> 'contentType', 'size', (a.value ->> 'size')::int) ORDER BY a.ordinality), '[]')
     FROM jsonb_array_elements(m.attachments) WITH ORDINALITY a) AS attachments`;

/** Captured messages, newest first (served by the (received_at, id) index read backwards). */
export async function listCaptured(query: MailboxQuery): Promise<CapturedMailSummary[]> {
  return db().query<CapturedMailSummary>(
    `SELECT ${summaryColumns} FROM captured_mail m
      WHERE (:to::text IS NULL OR m.envelope_to @> ARRAY[:to]::text[])
        AND (:since::timestamptz IS NULL OR m.received_at >= :since)
      ORDER BY m.received_at DESC, m.id DESC LIMIT :limit`,
    { replacements: { to: query.to ?? null, since: query.since ?? null, limit: query.limit }, type: QueryTypes.SELECT },
  );
}

export async function getCaptured(id: number): Promise<CapturedMail> {
  const [row] = await db().query<CapturedMail>(`SELECT ${summaryColumns}, m.text_body AS text, m.html_body AS html FROM captured_mail m WHERE m.id = :id`, {
    replacements: { id },
    type: QueryTypes.SELECT,
  });
  if (!row) throw notFound('Message');
  return row;
}

export async function capturedAttachment(id: number, index: number): Promise<{ filename: string; contentType: string; content: Buffer }> {
  const [row] = await db().query<{ filename: string; contentType: string; content: string }>(
    `SELECT a ->> 'filename' AS filename, a ->> 'contentType' AS "contentType", a ->> 'content' AS content
       FROM captured_mail m, jsonb_extract_path(m.attachments, :index) a WHERE m.id = :id`,
    { replacements: { id, index: String(index) }, type: QueryTypes.SELECT },
  );
  if (!row || row.content === null) throw notFound('Attachment');
  return { filename: row.filename, contentType: row.contentType, content: Buffer.from(row.content, 'base64') };
}

export async function clearCaptured(): Promise<number> {
  const [, meta] = await db().query('DELETE FROM captured_mail');
  return (meta as { rowCount?: number }).rowCount ?? 0;
}

/** Days of sent mail the outbox page counts. */
export const SENT_COUNT_DAYS = 7;

/**
 * The outbox as a manager sees it: newest first, optionally one status; counts of what waits, what failed, and
 * what was sent in the last SENT_COUNT_DAYS days (each read through its own partial index).
 */
export async function listOutbox(query: OutboxQuery): Promise<{ entries: OutboxEntry[]; counts: Record<'pending' | 'sent' | 'failed', number>; sentCountDays: number }> {
  const entries = await db().query<OutboxEntry>(
    `SELECT o.id::int AS id, o.kind, o.to_address AS "to", o.subject, o.status, o.attempts, o.last_error AS "lastError",
            ${iso('o.created_at')} AS "createdAt", ${iso('o.sent_at')} AS "sentAt", ${iso('o.next_attempt_at')} AS "nextAttemptAt"
       FROM outbox o WHERE (:status::text IS NULL OR o.status = :status)
      ORDER BY o.created_at DESC, o.id DESC LIMIT :limit`,
    { replacements: { status: query.status ?? null, limit: query.limit }, type: QueryTypes.SELECT },
  );
  const [counts] = await db().query<{ pending: number; failed: number; sent: number }>(
    `SELECT (SELECT count(*)::int FROM outbox WHERE status = 'pending') AS pending,
            (SELECT count(*)::int FROM outbox WHERE status = 'failed') AS failed,
            (SELECT count(*)::int FROM outbox WHERE status = 'sent' AND sent_at > now() - make_interval(days => :days)) AS sent`,
    { replacements: { days: SENT_COUNT_DAYS }, type: QueryTypes.SELECT },
  );
  return { entries, counts: counts!, sentCountDays: SENT_COUNT_DAYS };
}

/** Put failed rows back in the queue, due now (one, or all when `id` is null); returns how many. */
export async function retryFailed(id: number | null): Promise<number> {
  const [rows] = await db().query(
    `UPDATE outbox SET status = 'pending', next_attempt_at = now() WHERE status = 'failed' AND (:id::bigint IS NULL OR id = :id) RETURNING id`,
    { replacements: { id } },
  );
  const n = (rows as unknown[]).length;
  if (id !== null && n === 0) throw notFound('Failed message');
  if (n) outboxQueued.emit('queued');
  return n;
}
