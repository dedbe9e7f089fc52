import { QueryTypes } from 'sequelize';
import type { CapturedMail, CapturedMailSummary, MailboxQuery, OutboxEntry, OutboxQuery } from '../../../shared/schemas/mail.js';
import { notFound } from '../../lib/errors.js';
import { OutboxModel } from './mail.model.js';

const db = () => OutboxModel.sequelize!;
const iso = (column: string) => `to_char(${column} AT TIME ZONE 'UTC', 'YYYY-MM-DD"T"HH24:MI:SS.MS"Z"')`;

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
      WHERE (:to::text IS NULL OR :to = ANY (m.envelope_to))
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

/** The outbox as a manager sees it: newest first, optionally one status. */
export async function listOutbox(query: OutboxQuery): Promise<{ entries: OutboxEntry[]; counts: Record<'pending' | 'sent' | 'failed', number> }> {
  const entries = await db().query<OutboxEntry>(
    `SELECT o.id::int AS id, o.kind, o.to_address AS "to", o.subject, o.status, o.attempts, o.last_error AS "lastError",
            ${iso('o.created_at')} AS "createdAt", ${iso('o.sent_at')} AS "sentAt", ${iso('o.next_attempt_at')} AS "nextAttemptAt"
       FROM outbox o WHERE (:status::text IS NULL OR o.status = :status)
      ORDER BY o.created_at DESC, o.id DESC LIMIT :limit`,
    { replacements: { status: query.status ?? null, limit: query.limit }, type: QueryTypes.SELECT },
  );
  const rows = await db().query<{ status: 'pending' | 'sent' | 'failed'; n: number }>(`SELECT status, count(*)::int AS n FROM outbox GROUP BY status`, { type: QueryTypes.SELECT });
  const counts = { pending: 0, sent: 0, failed: 0 };
  for (const r of rows) counts[r.status] = r.n;
  return { entries, counts };
}
