import { Op, UniqueConstraintError, type WhereOptions } from 'sequelize';
import { cableElectrical } from '../../../shared/domain/cable.js';
import { toFieldIssues } from '../../../shared/errors.js';
import { partInputSchema, type Part, type PartInput, type PartKind, type PartStatus, type PartValues } from '../../../shared/schemas/parts.js';
import { AppError, conflict, notFound } from '../../lib/errors.js';
import { PartModel } from './part.model.js';

const storedFields = [
  'tag', 'kind', 'description', 'connectorA', 'genderA', 'connectorB', 'genderB', 'status', 'notes', 'lengthMm', 'dielectric', 'velocityFactor',
  'lossDbPerM', 'lossRefHz', 'measuredDelayPs', 'measuredOn', 'measuredHow', 'lossDb', 'delayPs', 'maxInputDbm',
  'minFrequencyHz', 'maxFrequencyHz',
] as const satisfies readonly (keyof PartValues)[];

function values(row: PartModel): PartValues {
  return Object.fromEntries(storedFields.map((k) => [k, row[k]])) as PartValues;
}

/**
 * A part with its electrical facts. For a cable, `delayPs` is the measured delay where one is recorded,
 * else L/(VF·c), and `velocityFactor` the one in use; other kinds report their entered delay.
 */
export function describePart(v: PartValues): Omit<Part, 'id' | 'createdAt' | 'updatedAt'> {
  if (v.kind === 'cable' && v.lengthMm !== null && v.dielectric !== null) {
    const e = cableElectrical({ lengthMm: v.lengthMm, dielectric: v.dielectric, velocityFactor: v.velocityFactor, measuredDelayPs: v.measuredDelayPs });
    return { ...v, ...e };
  }
  return {
    ...v,
    computedDelayPs: null,
    delaySource: v.delayPs === null ? null : 'entered',
    velocityFactorSource: null,
    delayPerMetrePs: null,
    freeSpaceLengthMm: null,
  };
}

function toPart(row: PartModel): Part {
  return { id: row.id, ...describePart(values(row)), createdAt: row.createdAt.toISOString(), updatedAt: row.updatedAt.toISOString() };
}

const duplicateTag = (tag: string) =>
  conflict('tag_taken', `A part tagged ${tag} already exists.`, [{ path: 'tag', message: 'A part with that tag already exists' }]);

/** Fields that do not apply to a kind are stored empty, so a cable never carries an attenuator's rating. */
function forKind(v: PartValues): PartValues {
  const cable = v.kind === 'cable';
  return {
    ...v,
    lengthMm: cable ? v.lengthMm : null,
    dielectric: cable ? v.dielectric : null,
    velocityFactor: cable ? v.velocityFactor : null,
    lossDbPerM: cable ? v.lossDbPerM : null,
    lossRefHz: cable ? v.lossRefHz : null,
    measuredDelayPs: cable ? v.measuredDelayPs : null,
    measuredOn: cable ? v.measuredOn : null,
    measuredHow: cable ? v.measuredHow : null,
    lossDb: cable ? null : v.lossDb,
    delayPs: cable ? null : v.delayPs,
    maxInputDbm: v.kind === 'attenuator' ? v.maxInputDbm : null,
  };
}

export async function listParts(filters: { kind?: PartKind; status?: PartStatus; q?: string }): Promise<Part[]> {
  const where: WhereOptions<PartModel> = {};
  if (filters.kind) Object.assign(where, { kind: filters.kind });
  if (filters.status) Object.assign(where, { status: filters.status });
  if (filters.q) {
    const like = `%${filters.q.replace(/[\\%_]/g, (c) => `\\${c}`)}%`;
    Object.assign(where, { [Op.or]: [{ tag: { [Op.iLike]: like } }, { description: { [Op.iLike]: like } }, { notes: { [Op.iLike]: like } }] });
  }
  const rows = await PartModel.findAll({ where, order: [['tag', 'ASC']] });
  return rows.map(toPart);
}

async function findRow(id: number): Promise<PartModel> {
  const row = await PartModel.findByPk(id);
  if (!row) throw notFound('Part');
  return row;
}

export async function getPart(id: number): Promise<Part> {
  return toPart(await findRow(id));
}

export async function createPart(input: PartValues): Promise<Part> {
  try {
    return toPart(await PartModel.create(forKind(input)));
  } catch (err) {
    if (err instanceof UniqueConstraintError) throw duplicateTag(input.tag);
    throw err;
  }
}

export async function updatePart(id: number, patch: Partial<PartInput>): Promise<Part> {
  const row = await findRow(id);
  const merged = partInputSchema.safeParse({ ...values(row), ...patch });
  if (!merged.success) throw new AppError(400, 'validation_failed', 'Some fields are not valid.', toFieldIssues(merged.error.issues));
  try {
    return toPart(await row.update(forKind(merged.data)));
  } catch (err) {
    if (err instanceof UniqueConstraintError) throw duplicateTag(merged.data.tag);
    throw err;
  }
}

/** Every part in tag order, as stored (for the CSV export). */
export async function allPartValues(): Promise<PartValues[]> {
  return (await PartModel.findAll({ order: [['tag', 'ASC']] })).map(values);
}

/** Insert many parts in one transaction: all or nothing. Duplicate tags (against the stock or within the batch) are refused. */
export async function importParts(rows: PartValues[]): Promise<number> {
  const sequelize = PartModel.sequelize!;
  return sequelize.transaction(async (transaction) => {
    try {
      await PartModel.bulkCreate(rows.map(forKind), { transaction });
    } catch (err) {
      if (err instanceof UniqueConstraintError) throw conflict('tag_taken', 'A tag in the file already exists in the inventory; nothing was imported.');
      throw err;
    }
    return rows.length;
  });
}

/** Parts by id (any order; missing ids are simply absent), for resolving setup segments. */
export async function partsByIds(ids: number[]): Promise<Part[]> {
  if (ids.length === 0) return [];
  return (await PartModel.findAll({ where: { id: ids } })).map(toPart);
}
