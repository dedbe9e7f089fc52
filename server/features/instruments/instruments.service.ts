import { Op, QueryTypes, UniqueConstraintError, type WhereOptions } from 'sequelize';
import { calibrationState, dateInZone } from '../../../shared/domain/calibration.js';
import { toFieldIssues } from '../../../shared/errors.js';
import {
  instrumentInputSchema,
  type Instrument,
  type InstrumentInput,
  type InstrumentKind,
  type InstrumentStatus,
  type InstrumentValues,
  type Qualification,
} from '../../../shared/schemas/instruments.js';
import { AppError, conflict, notFound } from '../../lib/errors.js';
import { InstrumentModel, QualificationModel } from './instrument.model.js';

/** Today's date in the lab's time zone; calibration states are judged on the lab's calendar. */
export const labToday = (timeZone: string, now = new Date()) => dateInZone(now, timeZone);

function values(row: InstrumentModel): InstrumentValues {
  return {
    tag: row.tag,
    name: row.name,
    kind: row.kind,
    location: row.location,
    status: row.status,
    calibrationDueOn: row.calibrationDueOn,
    minFrequencyHz: row.minFrequencyHz,
    maxFrequencyHz: row.maxFrequencyHz,
    maxSafeInputDbm: row.maxSafeInputDbm,
    qualificationRequired: row.qualificationRequired,
    maxBookingHours: row.maxBookingHours,
    minGapMinutes: row.minGapMinutes,
    advanceDays: row.advanceDays,
    notes: row.notes,
  };
}

function toInstrument(row: InstrumentModel, today: string): Instrument {
  return {
    id: row.id,
    ...values(row),
    calibration: calibrationState(row.calibrationDueOn, today),
    createdAt: row.createdAt.toISOString(),
    updatedAt: row.updatedAt.toISOString(),
  };
}

const duplicateTag = () =>
  conflict('tag_taken', 'An instrument with that tag already exists.', [{ path: 'tag', message: 'An instrument with that tag already exists' }]);

export async function listInstruments(filters: { kind?: InstrumentKind; status?: InstrumentStatus; q?: string }, today: string): Promise<Instrument[]> {
  const where: WhereOptions<InstrumentModel> = {};
  if (filters.kind) Object.assign(where, { kind: filters.kind });
  if (filters.status) Object.assign(where, { status: filters.status });
  if (filters.q) {
    const like = `%${filters.q.replace(/[\\%_]/g, (c) => `\\${c}`)}%`;
    Object.assign(where, { [Op.or]: [{ tag: { [Op.iLike]: like } }, { name: { [Op.iLike]: like } }, { location: { [Op.iLike]: like } }] });
  }
  const rows = await InstrumentModel.findAll({ where, order: [['tag', 'ASC']] });
  return rows.map((row) => toInstrument(row, today));
}

async function findRow(id: number): Promise<InstrumentModel> {
  const row = await InstrumentModel.findByPk(id);
  if (!row) throw notFound('Instrument');
  return row;
}

export async function getInstrument(id: number, today: string): Promise<Instrument> {
  return toInstrument(await findRow(id), today);
}

export async function createInstrument(input: InstrumentValues, today: string): Promise<Instrument> {
  try {
    return toInstrument(await InstrumentModel.create(input), today);
  } catch (err) {
    if (err instanceof UniqueConstraintError) throw duplicateTag();
    throw err;
  }
}

/** Merge the change into the stored record and validate the whole, so cross-field rules hold after every edit. */
export async function updateInstrument(id: number, patch: Partial<InstrumentInput>, today: string): Promise<Instrument> {
  const row = await findRow(id);
  const merged = instrumentInputSchema.safeParse({ ...values(row), ...patch });
  if (!merged.success) throw new AppError(400, 'validation_failed', 'Some fields are not valid.', toFieldIssues(merged.error.issues));
  try {
    return toInstrument(await row.update(merged.data), today);
  } catch (err) {
    if (err instanceof UniqueConstraintError) throw duplicateTag();
    throw err;
  }
}

export async function listQualifications(instrumentId: number): Promise<Qualification[]> {
  await findRow(instrumentId);
  const rows = await QualificationModel.sequelize!.query<{ user_id: number; name: string; email: string; granted_at: Date; granted_by_name: string | null }>(
    `SELECT q.user_id, u.name, u.email, q.granted_at, g.name AS granted_by_name
       FROM instrument_qualifications q
       JOIN users u ON u.id = q.user_id
       LEFT JOIN users g ON g.id = q.granted_by
      WHERE q.instrument_id = :instrumentId
      ORDER BY u.name`,
    { replacements: { instrumentId }, type: QueryTypes.SELECT },
  );
  return rows.map((r) => ({ userId: r.user_id, name: r.name, email: r.email, grantedAt: new Date(r.granted_at).toISOString(), grantedBy: r.granted_by_name }));
}

/** Record that a person holds the qualification for an instrument; granting twice is harmless. */
export async function grantQualification(instrumentId: number, userId: number, grantedBy: number): Promise<Qualification[]> {
  await findRow(instrumentId);
  const [user] = await QualificationModel.sequelize!.query<{ id: number }>('SELECT id FROM users WHERE id = :userId', {
    replacements: { userId },
    type: QueryTypes.SELECT,
  });
  if (!user) throw new AppError(400, 'validation_failed', 'That person does not exist.', [{ path: 'userId', message: 'Choose an existing person' }]);
  await QualificationModel.findOrCreate({ where: { instrumentId, userId }, defaults: { instrumentId, userId, grantedBy } });
  return listQualifications(instrumentId);
}

export async function revokeQualification(instrumentId: number, userId: number): Promise<void> {
  await findRow(instrumentId);
  const removed = await QualificationModel.destroy({ where: { instrumentId, userId } });
  if (!removed) throw notFound('Qualification');
}

/** Whether a person holds the qualification for an instrument (used by booking rules). */
export async function holdsQualification(instrumentId: number, userId: number): Promise<boolean> {
  return (await QualificationModel.count({ where: { instrumentId, userId } })) > 0;
}
