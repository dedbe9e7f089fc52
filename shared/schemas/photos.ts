import { z } from 'zod';
import type { Role } from '../domain/roles.js';

/** What a photo can show. Setups arrive later; photos of them are already part of the contract. */
export const photoSubjectTypes = ['instrument', 'part', 'setup'] as const;
export type PhotoSubjectType = (typeof photoSubjectTypes)[number];

/** Least role that may add photos to each kind of subject: instruments and parts are manager-kept inventory. */
export const photoUploadRoles: Record<PhotoSubjectType, Role> = {
  instrument: 'manager',
  part: 'manager',
  setup: 'researcher',
};

/**
 * Types offered by the file picker. Only a hint for the browser: the server decides by decoding the
 * file, never by its name or the MIME type the client sends.
 */
export const acceptedPhotoTypes = ['image/jpeg', 'image/png', 'image/webp'] as const;

const subjectTypeSchema = z.enum(photoSubjectTypes, { error: 'Choose instrument, part or setup' });

const idSchema = (what: string) =>
  z.coerce
    .number({ error: `${what} must be a number` })
    .int({ error: `${what} must be a whole number` })
    .positive({ error: `${what} must be positive` })
    .max(2147483647, { error: `${what} is too large` });

export const photoCaptionSchema = z
  .string({ error: 'Caption must be text' })
  .trim()
  .max(500, { error: 'Caption must be at most 500 characters' });

/** The text fields of the multipart upload `POST /api/photos`; the image itself is the file field `file`. */
export const createPhotoInputSchema = z.strictObject({
  subjectType: subjectTypeSchema,
  subjectId: idSchema('subjectId'),
  caption: photoCaptionSchema.default(''),
});
export type CreatePhotoInput = z.infer<typeof createPhotoInputSchema>;

export const updatePhotoInputSchema = z.strictObject({ caption: photoCaptionSchema });
export type UpdatePhotoInput = z.infer<typeof updatePhotoInputSchema>;

export const photoListQuerySchema = z.object({
  subjectType: subjectTypeSchema,
  subjectId: idSchema('subjectId'),
});

export const photoParamsSchema = z.object({ id: idSchema('id') });

export const photoSchema = z.object({
  id: z.number().int(),
  subjectType: subjectTypeSchema,
  subjectId: z.number().int(),
  ownerId: z.number().int(),
  ownerName: z.string(),
  caption: z.string(),
  /** Size of the display version (upright, longest side at most 2048 px). */
  width: z.number().int(),
  height: z.number().int(),
  bytes: z.number().int(),
  displayUrl: z.string(),
  thumbUrl: z.string(),
  createdAt: z.string(),
});
export type Photo = z.infer<typeof photoSchema>;

export const photoListSchema = z.object({ photos: z.array(photoSchema) });
export const photoResponseSchema = z.object({ photo: photoSchema });
