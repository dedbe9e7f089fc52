import { QueryTypes } from 'sequelize';
import { hasRole } from '../../../shared/domain/roles.js';
import type { SessionUser } from '../../../shared/schemas/people.js';
import {
  photoUploadRoles,
  type CreatePhotoInput,
  type Photo,
  type PhotoSubjectType,
  type UpdatePhotoInput,
} from '../../../shared/schemas/photos.js';
import { AppError, forbidden, notFound } from '../../lib/errors.js';
import type { ImageStore, ImageVariant } from '../../lib/uploads.js';
import { PhotoModel } from './photo.model.js';

/** The table of each kind of subject. Fixed names only: they are put into SQL. */
const subjectTables: Record<PhotoSubjectType, string> = {
  instrument: 'instruments',
  part: 'parts',
  setup: 'setups',
};

const subjectLabels: Record<PhotoSubjectType, string> = {
  instrument: 'Instrument',
  part: 'Part',
  setup: 'Setup',
};

const withOwner = { include: [{ association: 'owner', attributes: ['name'] }] };

function toPhoto(row: PhotoModel, ownerName: string): Photo {
  return {
    id: row.id,
    subjectType: row.subjectType,
    subjectId: row.subjectId,
    ownerId: row.ownerId,
    ownerName,
    caption: row.caption,
    width: row.width,
    height: row.height,
    bytes: row.bytes,
    displayUrl: `/api/photos/${row.id}/display`,
    thumbUrl: `/api/photos/${row.id}/thumb`,
    createdAt: row.createdAt.toISOString(),
  };
}

/** 404 unless the subject exists; a kind whose table does not exist yet (setups) has no subjects at all. */
async function assertSubjectExists(subjectType: PhotoSubjectType, subjectId: number): Promise<void> {
  const sequelize = PhotoModel.sequelize!;
  const table = subjectTables[subjectType];
  // Asking first keeps a missing table from becoming a database error (a 500).
  const [{ exists }] = await sequelize.query<{ exists: boolean }>(`SELECT to_regclass(:table) IS NOT NULL AS exists`, {
    replacements: { table },
    type: QueryTypes.SELECT,
  });
  const rows = exists
    ? await sequelize.query(`SELECT 1 FROM ${table} WHERE id = :id`, { replacements: { id: subjectId }, type: QueryTypes.SELECT })
    : [];
  if (!rows.length) throw notFound(subjectLabels[subjectType]);
}

/** Only the uploader and managers may change or remove a photo. */
function assertMayChange(user: SessionUser, row: PhotoModel): void {
  if (row.ownerId !== user.id && user.role !== 'manager') {
    throw forbidden('Only the person who added this photo, or a lab manager, can change or remove it.');
  }
}

async function findPhoto(id: number): Promise<PhotoModel> {
  const row = await PhotoModel.findByPk(id, withOwner);
  if (!row) throw notFound('Photo');
  return row;
}

export async function listPhotos(subjectType: PhotoSubjectType, subjectId: number): Promise<Photo[]> {
  const rows = await PhotoModel.findAll({
    where: { subjectType, subjectId },
    order: [['createdAt', 'DESC'], ['id', 'DESC']],
    ...withOwner,
  });
  return rows.map((row) => toPhoto(row, row.owner!.name));
}

/**
 * Store an uploaded image for a subject. Cheap refusals (role, missing subject, no file) come before any
 * decoding; once files are written, a failure removes them, so a refused upload leaves nothing behind.
 */
export async function createPhoto(store: ImageStore, user: SessionUser, input: CreatePhotoInput, file: Buffer | undefined): Promise<Photo> {
  if (!hasRole(user.role, photoUploadRoles[input.subjectType])) {
    throw forbidden(
      input.subjectType === 'setup'
        ? 'Only researchers and lab managers can add photos of setups.'
        : 'Only lab managers can add photos of instruments and parts.',
    );
  }
  await assertSubjectExists(input.subjectType, input.subjectId);
  if (!file) {
    const message = 'Choose an image to upload';
    throw new AppError(400, 'validation_failed', `${message}.`, [{ path: 'file', message }]);
  }
  const stored = await store.save(file);
  try {
    const row = await PhotoModel.create({
      subjectType: input.subjectType,
      subjectId: input.subjectId,
      ownerId: user.id,
      caption: input.caption,
      width: stored.width,
      height: stored.height,
      bytes: stored.bytes,
      thumbWidth: stored.thumbWidth,
      thumbHeight: stored.thumbHeight,
      fileKey: stored.key,
    });
    return toPhoto(row, user.name);
  } catch (err) {
    await store.remove(stored.key);
    throw err;
  }
}

export async function updatePhoto(user: SessionUser, id: number, changes: UpdatePhotoInput): Promise<Photo> {
  const row = await findPhoto(id);
  assertMayChange(user, row);
  await row.update({ caption: changes.caption });
  return toPhoto(row, row.owner!.name);
}

/** Delete the row first, then the files: a failure in between leaves unused files, never a photo without its image. */
export async function deletePhoto(store: ImageStore, user: SessionUser, id: number): Promise<void> {
  const row = await findPhoto(id);
  assertMayChange(user, row);
  await row.destroy();
  await store.remove(row.fileKey);
}

export async function readPhotoImage(store: ImageStore, id: number, variant: ImageVariant): Promise<{ data: Buffer; contentType: string }> {
  const row = await PhotoModel.findByPk(id, { attributes: ['fileKey'] });
  if (!row) throw notFound('Photo');
  return { data: await store.read(row.fileKey, variant), contentType: store.contentType };
}
