import { QueryTypes, type Transaction } from 'sequelize';
import { stringify } from 'csv-stringify/sync';
import { segmentDelayPs, segmentLossDb, type AnalysisResult } from '../../../shared/domain/analysis.js';
import { hasRole } from '../../../shared/domain/roles.js';
import { MAX_BOOKING_DAYS } from '../../../shared/schemas/bookings.js';
import { describeSegment, diffSetups, type SetupDiff } from '../../../shared/domain/setup-diff.js';
import type { SessionUser } from '../../../shared/schemas/people.js';
import type { Setup, SetupDocument } from '../../../shared/schemas/setups.js';
import { AppError, forbidden, notFound } from '../../lib/errors.js';
import { analyse, resolveSegments } from '../analysis/analysis.service.js';
import { partsByIds } from '../parts/parts.service.js';
import { SetupModel } from './setup.model.js';
import { isoUtcSql } from '../../lib/sql.js';

const db = () => SetupModel.sequelize!;
const iso = isoUtcSql;

/** The booking a setup belongs to must exist; only its owner or a manager records setups for it. */
async function bookingFor(user: SessionUser, bookingId: number): Promise<{ id: number; ownerId: number }> {
  const [booking] = await db().query<{ id: number; ownerId: number; status: string }>('SELECT id, owner_id AS "ownerId", status FROM bookings WHERE id = :bookingId', {
    replacements: { bookingId },
    type: QueryTypes.SELECT,
  });
  if (!booking) throw new AppError(400, 'validation_failed', 'That booking does not exist.', [{ path: 'bookingId', message: 'Choose an existing booking' }]);
  if (!hasRole(user.role, 'researcher')) throw forbidden('Visitors read setups but cannot record them.');
  if (booking.ownerId !== user.id && user.role !== 'manager') throw forbidden('You can record setups only for your own bookings.');
  return booking;
}

async function writeRevision(setupId: number, number: number, document: SetupDocument, note: string, user: SessionUser, transaction: Transaction): Promise<number> {
  // The server's analysis is computed from the document as saved, and stored with it.
  const analysis = await analyse(document.analysis).catch((err: unknown) => {
    // Field paths of the analysis document sit under `document.analysis` in a setup request.
    if (err instanceof AppError && Array.isArray(err.details)) {
      throw new AppError(err.status, err.code, err.message, (err.details as { path: string; message: string }[]).map((d) => ({ ...d, path: `document.analysis.${d.path}` })));
    }
    throw err;
  });
  const [row] = await db().query<{ id: number }>(
    `INSERT INTO setup_revisions (setup_id, number, document, analysis, saved_by, note) VALUES (:setupId, :number, :document, :analysis, :userId, :note) RETURNING id`,
    { replacements: { setupId, number, document: JSON.stringify(document), analysis: JSON.stringify(analysis), userId: user.id, note }, type: QueryTypes.SELECT, transaction },
  );
  return row!.id;
}

export async function createSetup(user: SessionUser, input: { bookingId: number; document: SetupDocument; note: string }, reloadedFromRevisionId: number | null = null): Promise<Setup> {
  const booking = await bookingFor(user, input.bookingId);
  const id = await db().transaction(async (transaction) => {
    const setup = await SetupModel.create({ bookingId: booking.id, ownerId: booking.ownerId, title: input.document.title, reloadedFromRevisionId }, { transaction });
    await writeRevision(setup.id, 1, input.document, input.note, user, transaction);
    return setup.id;
  });
  return getSetup(user, id);
}

/** Save a new revision: the previous ones stay exactly as they were. */
export async function saveRevision(user: SessionUser, id: number, input: { document: SetupDocument; note: string }): Promise<Setup> {
  await db().transaction(async (transaction) => {
    const setup = await SetupModel.findByPk(id, { transaction, lock: transaction.LOCK.UPDATE });
    if (!setup) throw notFound('Setup');
    if (setup.ownerId !== user.id && user.role !== 'manager') throw forbidden('Only the person who booked the bench or a lab manager may change this setup.');
    const [last] = await db().query<{ n: number }>('SELECT max(number) AS n FROM setup_revisions WHERE setup_id = :id', { replacements: { id }, type: QueryTypes.SELECT, transaction });
    await writeRevision(id, (last?.n ?? 0) + 1, input.document, input.note, user, transaction);
    await setup.update({ title: input.document.title }, { transaction });
  });
  return getSetup(user, id);
}

/** Start a new setup for another booking from any revision ("reload last week's setup"). */
export async function reloadSetup(user: SessionUser, id: number, input: { bookingId: number; revision?: number }): Promise<Setup> {
  const source = await revisionRow(id, input.revision);
  return createSetup(user, { bookingId: input.bookingId, document: source.document, note: `Reloaded from setup ${id}, revision ${source.number}` }, source.id);
}

interface RevisionRow {
  id: number;
  number: number;
  document: SetupDocument;
  analysis: AnalysisResult;
  savedAt: string;
  savedBy: { id: number; name: string };
  note: string;
}

async function revisionRow(setupId: number, number?: number): Promise<RevisionRow> {
  const [row] = await db().query<RevisionRow>(
    `SELECT r.id, r.number, r.document, r.analysis, ${iso('r.saved_at')} AS "savedAt", json_build_object('id', u.id, 'name', u.name) AS "savedBy", r.note
       FROM setup_revisions r JOIN users u ON u.id = r.saved_by
      WHERE r.setup_id = :setupId ${number === undefined ? '' : 'AND r.number = :number'}
      ORDER BY r.number DESC LIMIT 1`,
    { replacements: { setupId, number: number ?? null }, type: QueryTypes.SELECT },
  );
  if (!row) throw notFound(number === undefined ? 'Setup' : `Revision ${number}`);
  return row;
}

/** A part that a setup wires (at its latest revision) in an active booking overlapping a time slot. */
export type PartHeld = Setup['partsHeld'][number];

/**
 * Parts wired by the latest revision of any setup of a confirmed or checked-in booking that overlaps
 * [startsAt, endsAt), except setup `exceptSetupId` (a setup's own parts are not held against it); with
 * `amongRevisionId`, only the parts that this revision wires too. The bookings are a range read on
 * bookings_status_starts_at_idx (status, starts_at): a booking lasts at most MAX_BOOKING_DAYS, so one that
 * overlaps the slot starts less than that before it; setups come by setups_booking_id_idx, their latest
 * revision by the unique (setup_id, number).
 */
export async function partsHeldDuring(
  slot: { startsAt: string; endsAt: string },
  options: { exceptSetupId?: number | null; amongRevisionId?: number } = {},
): Promise<PartHeld[]> {
  const among = options.amongRevisionId !== undefined;
  return db().query<PartHeld>(
    `WITH ${among ? `mine AS (
       SELECT DISTINCT (v #>> '{}')::int AS part_id
         FROM setup_revisions r, jsonb_path_query(r.document, '$.analysis.paths[*].segments[*].partId') AS v
        WHERE r.id = :revisionId),` : ''}
     others AS (
       SELECT s.id, s.title, s.booking_id, u.name, r.document
         FROM bookings b
         JOIN setups s ON s.booking_id = b.id AND s.id <> :exceptSetupId
         JOIN users u ON u.id = s.owner_id
         JOIN LATERAL (SELECT document FROM setup_revisions WHERE setup_id = s.id ORDER BY number DESC LIMIT 1) r ON true
        WHERE b.status IN ('confirmed', 'checked-in')
          AND b.starts_at < :endsAt AND b.starts_at > (:startsAt)::timestamptz - interval '${MAX_BOOKING_DAYS} days' AND b.ends_at > :startsAt)
     SELECT DISTINCT o.id AS "setupId", o.title AS "setupTitle", o.booking_id AS "bookingId", o.name AS owner, p.id AS "partId", p.tag
       FROM others o
       CROSS JOIN LATERAL jsonb_path_query(o.document, '$.analysis.paths[*].segments[*].partId') AS v
       ${among ? `JOIN mine ON mine.part_id = (v #>> '{}')::int` : ''}
       JOIN parts p ON p.id = (v #>> '{}')::int
      ORDER BY p.tag, o.id`,
    {
      replacements: { exceptSetupId: options.exceptSetupId ?? 0, revisionId: options.amongRevisionId ?? null, startsAt: slot.startsAt, endsAt: slot.endsAt },
      type: QueryTypes.SELECT,
    },
  );
}

/** Parts of this revision that another setup holds in a booking overlapping this setup's booking. */
function partsHeld(setupId: number, revisionId: number, booking: { startsAt: string; endsAt: string }): Promise<PartHeld[]> {
  return partsHeldDuring(booking, { exceptSetupId: setupId, amongRevisionId: revisionId });
}

/** The time slot of a booking, or of a setup's booking (for the parts other setups hold meanwhile); null when there is none. */
export async function bookingSlot(ref: { bookingId: number } | { setupId: number }): Promise<{ bookingId: number; startsAt: string; endsAt: string } | null> {
  const [row] = await db().query<{ bookingId: number; startsAt: string; endsAt: string }>(
    'setupId' in ref
      ? `SELECT b.id AS "bookingId", ${iso('b.starts_at')} AS "startsAt", ${iso('b.ends_at')} AS "endsAt" FROM setups s JOIN bookings b ON b.id = s.booking_id WHERE s.id = :id`
      : `SELECT b.id AS "bookingId", ${iso('b.starts_at')} AS "startsAt", ${iso('b.ends_at')} AS "endsAt" FROM bookings b WHERE b.id = :id`,
    { replacements: { id: 'setupId' in ref ? ref.setupId : ref.bookingId }, type: QueryTypes.SELECT },
  );
  return row ?? null;
}

/** A setup at its latest revision, or at revision `number`. */
export async function getSetup(user: SessionUser, id: number, number?: number): Promise<Setup> {
  const [head] = await db().query<Omit<Setup, 'revision' | 'revisions' | 'partsHeld' | 'canEdit'> & { ownerId: number }>(
    `SELECT s.id, s.booking_id AS "bookingId", s.owner_id AS "ownerId", s.title, ${iso('s.created_at')} AS "createdAt",
            json_build_object('id', u.id, 'name', u.name) AS owner,
            json_build_object('startsAt', ${iso('b.starts_at')}, 'endsAt', ${iso('b.ends_at')},
              'instruments', (SELECT coalesce(json_agg(json_build_object('id', i.id, 'tag', i.tag) ORDER BY i.tag), '[]') FROM booking_instruments bi JOIN instruments i ON i.id = bi.instrument_id WHERE bi.booking_id = b.id)) AS booking,
            (SELECT json_build_object('setupId', r.setup_id, 'revision', r.number, 'title', s2.title)
               FROM setup_revisions r JOIN setups s2 ON s2.id = r.setup_id WHERE r.id = s.reloaded_from_revision_id) AS "reloadedFrom"
       FROM setups s JOIN users u ON u.id = s.owner_id JOIN bookings b ON b.id = s.booking_id
      WHERE s.id = :id`,
    { replacements: { id }, type: QueryTypes.SELECT },
  );
  if (!head) throw notFound('Setup');
  const revision = await revisionRow(id, number);
  const revisions = await db().query<Setup['revisions'][number]>(
    `SELECT r.id, r.number, ${iso('r.saved_at')} AS "savedAt", json_build_object('id', u.id, 'name', u.name) AS "savedBy", r.note
       FROM setup_revisions r JOIN users u ON u.id = r.saved_by WHERE r.setup_id = :id ORDER BY r.number DESC`,
    { replacements: { id }, type: QueryTypes.SELECT },
  );
  const { ownerId, ...rest } = head;
  return {
    ...rest,
    revision,
    revisions,
    partsHeld: await partsHeld(id, revision.id, head.booking),
    canEdit: ownerId === user.id || user.role === 'manager',
  };
}

export async function listSetups(user: SessionUser, filter: { bookingId?: number; mine?: 'true' | 'false' }) {
  const where = [filter.bookingId ? 's.booking_id = :bookingId' : null, filter.mine === 'true' ? 's.owner_id = :userId' : null].filter(Boolean).join(' AND ') || 'true';
  return db().query(
    `SELECT s.id, s.booking_id AS "bookingId", s.title, json_build_object('id', u.id, 'name', u.name) AS owner,
            ${iso('b.starts_at')} AS "bookingStartsAt", (SELECT count(*)::int FROM setup_revisions r WHERE r.setup_id = s.id) AS revisions,
            ${iso('s.updated_at')} AS "updatedAt"
       FROM setups s JOIN users u ON u.id = s.owner_id JOIN bookings b ON b.id = s.booking_id
      WHERE ${where} ORDER BY s.updated_at DESC LIMIT 200`,
    { replacements: { bookingId: filter.bookingId ?? null, userId: user.id }, type: QueryTypes.SELECT },
  );
}

async function revisionById(revisionId: number): Promise<RevisionRow> {
  const [row] = await db().query<{ setupId: number; number: number }>('SELECT setup_id AS "setupId", number FROM setup_revisions WHERE id = :revisionId', {
    replacements: { revisionId },
    type: QueryTypes.SELECT,
  });
  if (!row) throw notFound(`Revision ${revisionId}`);
  return revisionRow(row.setupId, row.number);
}

/** Compare any two revisions (of one setup, or a setup and the one it was reloaded into). */
export async function compareRevisions(fromId: number, toId: number): Promise<SetupDiff> {
  const [a, b] = await Promise.all([revisionById(fromId), revisionById(toId)]);
  const ids = [a, b].flatMap((r) => r.document.analysis.paths.flatMap((p) => p.segments.flatMap((s) => ('partId' in s ? [s.partId] : []))));
  const tags = new Map((await partsByIds([...new Set(ids)])).map((p) => [p.id, p.tag]));
  const label = (s: Record<string, unknown>) => (typeof s.partId === 'number' ? tags.get(s.partId) ?? `part #${s.partId}` : describeSegment(s));
  return diffSetups(a.document, b.document, { before: a.analysis, after: b.analysis }, label);
}

/** The path/segment table of a revision as CSV, in wiring order. */
export async function pathsCsv(setupId: number, number: number): Promise<string> {
  const revision = await revisionRow(setupId, number);
  const resolved = await resolveSegments(revision.document.analysis);
  const ids = revision.document.analysis.paths.flatMap((p) => p.segments.flatMap((s) => ('partId' in s ? [s.partId] : [])));
  const parts = new Map((await partsByIds([...new Set(ids)])).map((p) => [p.id, p]));
  const frequency = new Map(revision.document.analysis.sources.map((s) => [s.key, s.frequencyHz]));
  const rows = resolved.paths.flatMap((path, i) =>
    path.segments.map((segment, j) => {
      const original = revision.document.analysis.paths[i]!.segments[j]!;
      const part = 'partId' in original ? parts.get(original.partId) : undefined;
      return [
        path.source,
        path.channel,
        j + 1,
        part?.tag ?? '',
        segment.kind,
        segment.kind === 'cable' ? segment.lengthMm : '',
        part?.connectorA ?? '',
        part?.connectorB ?? '',
        segmentDelayPs(segment).toFixed(3),
        segmentLossDb(segment, frequency.get(path.source)!).toFixed(3),
      ];
    }),
  );
  return stringify(rows, { header: true, columns: ['source', 'channel', 'order', 'tag', 'kind', 'lengthMm', 'connectorA', 'connectorB', 'delayPs', 'lossDbAtSourceFrequency'], record_delimiter: 'windows' });
}
