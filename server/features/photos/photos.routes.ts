import { Router, type RequestHandler } from 'express';
import type { UploadsConfig } from '../../config.js';
import {
  createPhotoInputSchema,
  photoListQuerySchema,
  photoParamsSchema,
  updatePhotoInputSchema,
} from '../../../shared/schemas/photos.js';
import { currentUser, requireRole, requireUser } from '../../lib/auth.js';
import { createImageStore, type ImageVariant } from '../../lib/uploads.js';
import { validate } from '../../lib/validate.js';
import * as photos from './photos.service.js';

/** Photos of instruments, parts and setups: /api/photos. Mounted under /api, so the CSRF check runs before multer. */
export function photosRouter(uploads: UploadsConfig): Router {
  const router = Router();
  const store = createImageStore(uploads);

  router.get('/', requireUser, validate({ query: photoListQuerySchema }), async (_req, res) => {
    const { subjectType, subjectId } = res.locals.query;
    res.json({ photos: await photos.listPhotos(subjectType, subjectId) });
  });

  // Visitors never upload, so they are refused before the body is read; the rule per subject type needs the
  // parsed fields and lives in the service.
  router.post('/', requireRole('researcher'), store.receive, validate({ body: createPhotoInputSchema }), async (req, res) => {
    res.status(201).json({ photo: await photos.createPhoto(store, currentUser(res.locals), res.locals.body, req.file?.buffer) });
  });

  const sendImage =
    (variant: ImageVariant): RequestHandler =>
    async (_req, res) => {
      const { data, contentType } = await photos.readPhotoImage(store, res.locals.params.id, variant);
      // Only signed-in people may see photos, so no shared cache may keep them.
      res.set('Cache-Control', 'private, max-age=3600').type(contentType).send(data);
    };
  router.get('/:id/display', requireUser, validate({ params: photoParamsSchema }), sendImage('display'));
  router.get('/:id/thumb', requireUser, validate({ params: photoParamsSchema }), sendImage('thumb'));

  router.patch('/:id', requireUser, validate({ params: photoParamsSchema, body: updatePhotoInputSchema }), async (_req, res) => {
    res.json({ photo: await photos.updatePhoto(currentUser(res.locals), res.locals.params.id, res.locals.body) });
  });

  router.delete('/:id', requireUser, validate({ params: photoParamsSchema }), async (_req, res) => {
    await photos.deletePhoto(store, currentUser(res.locals), res.locals.params.id);
    res.status(204).end();
  });

  return router;
}
