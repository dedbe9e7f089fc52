// Daily messages, once per lab day however many server instances run: the first instance to insert the day's
// row into mail_digests queues the messages in the same transaction; the others find the day taken.
import { QueryTypes, type Transaction } from 'sequelize';
import { daysUntil, dateInZone } from '../../../shared/domain/calibration.js';
import { addDays, labWallTimeToUtc } from '../../../shared/domain/lab-time.js';
import { OutboxModel } from './mail.model.js';
import { enqueueForUser } from './outbox.service.js';
import { calibrationDigestMail, type CalibrationDue } from './templates/calibration.js';
import type { MailLab } from './templates/compose.js';

export interface DigestLab extends MailLab {
  timeZone: string;
}

/** The digests go out from this time of the lab's day on (or as soon as a server runs after it). */
export const DIGEST_FROM_LAB_TIME = '07:00';
/** The calibration digest lists what is overdue or falls due within this many days. */
export const CALIBRATION_DIGEST_DAYS = 14;

const db = () => OutboxModel.sequelize!;

/** Claim (kind, day) for this transaction; false when another instance (or an earlier run) already has it. */
async function claimDay(kind: string, labDate: string, transaction: Transaction): Promise<boolean> {
  const rows = await db().query('INSERT INTO mail_digests (kind, lab_date) VALUES (:kind, :labDate) ON CONFLICT DO NOTHING RETURNING kind', {
    replacements: { kind, labDate },
    type: QueryTypes.SELECT,
    transaction,
  });
  return rows.length > 0;
}

/**
 * Every active lab manager who keeps 'calibrationDigest' on gets one message listing the instruments (not retired)
 * whose calibration is overdue or falls due within 14 days, each with a link; nothing to report, no message.
 * Returns how many messages were queued.
 */
async function calibrationDigest(now: Date, lab: DigestLab): Promise<number> {
  const today = dateInZone(now, lab.timeZone);
  if (now < labWallTimeToUtc(today, DIGEST_FROM_LAB_TIME, lab.timeZone)) return 0;
  return db().transaction(async (transaction) => {
    // A concurrent claim of the same day waits on the primary key here until this transaction ends, then gives up.
    if (!(await claimDay('calibration-digest', today, transaction))) return 0;
    // instruments_calibration_due_on_idx serves the range; a retired instrument needs no calibration.
    const rows = await db().query<Omit<CalibrationDue, 'daysLeft'>>(
      `SELECT id, tag, name, to_char(calibration_due_on, 'YYYY-MM-DD') AS "dueOn"
         FROM instruments
        WHERE calibration_due_on <= :dueBy AND status <> 'retired'
        ORDER BY calibration_due_on, tag`,
      { replacements: { dueBy: addDays(today, CALIBRATION_DIGEST_DAYS) }, type: QueryTypes.SELECT, transaction },
    );
    if (!rows.length) return 0;
    const due = rows.map((r) => ({ ...r, daysLeft: daysUntil(r.dueOn, today) }));
    const managers = await db().query<{ id: number }>(`SELECT id FROM users WHERE role = 'manager' AND active AND password_hash IS NOT NULL ORDER BY id`, { type: QueryTypes.SELECT, transaction });
    let queued = 0;
    for (const m of managers) {
      const id = await enqueueForUser(transaction, 'calibration-digest', m.id, (r) => calibrationDigestMail(lab, r.name, today, CALIBRATION_DIGEST_DAYS, due));
      if (id !== null) queued += 1;
    }
    return queued;
  });
}

/** The daily messages that are due at `now`; run every minute by the server. Returns how many were queued. */
export async function runDailyDigests(now: Date, lab: DigestLab): Promise<number> {
  return calibrationDigest(now, lab);
}
