// The uploads folder and the image pipeline. The only module that touches the folder: every path in it is
// built here from a random key, never from anything the client sent.
import { randomUUID } from 'node:crypto';
import { mkdir, readFile, rm, writeFile } from 'node:fs/promises';
import path from 'node:path';
import type { RequestHandler } from 'express';
import multer from 'multer';
import sharp, { type OutputInfo } from 'sharp';
import type { UploadsConfig } from '../config.js';
import { AppError, notFound } from './errors.js';
import { logger } from './logger.js';

export type ImageVariant = 'display' | 'thumb';

/** Longest side of each stored version, px; smaller images are kept at their size. */
const longestSide: Record<ImageVariant, number> = { display: 2048, thumb: 320 };

/** Formats accepted as decoded by sharp; anything else (GIF, SVG, HEIF, TIFF, …) is refused. */
const acceptedFormats = new Set(['jpeg', 'png', 'webp']);

/** Every stored version is WebP: small, with alpha for PNGs, and shown by every current browser. */
export const storedImageType = 'image/webp';

const keyPattern = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/;

/** What was written for one image; width, height and bytes are those of the display version. */
export interface StoredImage {
  key: string;
  width: number;
  height: number;
  bytes: number;
  thumbWidth: number;
  thumbHeight: number;
}

const invalidImage = (message: string) => new AppError(400, 'invalid_image', message, [{ path: 'file', message }]);

function formatBytes(bytes: number): string {
  const mib = 1024 * 1024;
  return bytes >= mib ? `${Math.round((bytes / mib) * 10) / 10} MB` : `${Math.round(bytes / 1024)} KB`;
}

/** The image store over the configured folder. */
export function createImageStore(config: UploadsConfig) {
  const dir = path.resolve(config.dir);

  function fileOf(key: string, variant: ImageVariant): string {
    // Keys come from randomUUID; a stored key of any other shape must never become a path.
    if (!keyPattern.test(key)) throw new Error(`not an image key: ${JSON.stringify(key)}`);
    return path.join(dir, `${key}.${variant}.webp`);
  }

  const single = multer({
    storage: multer.memoryStorage(),
    limits: { fileSize: config.maxPhotoBytes, files: 1, fields: 10, fieldSize: 10_000, parts: 12 },
  }).single('file');

  function uploadError(err: unknown): AppError {
    if (err instanceof multer.MulterError) {
      if (err.code === 'LIMIT_FILE_SIZE') {
        return new AppError(413, 'payload_too_large', `The file is larger than ${formatBytes(config.maxPhotoBytes)}, the most Skewbench accepts for a photo.`);
      }
      if (err.code === 'LIMIT_UNEXPECTED_FILE' || err.code === 'LIMIT_FILE_COUNT') {
        const message = 'Send one image, in the form field "file"';
        return new AppError(400, 'validation_failed', `${message}.`, [{ path: 'file', message }]);
      }
      return new AppError(400, 'validation_failed', `The upload was refused: ${err.message}.`);
    }
    // Anything else multer passes on is busboy failing to parse the body: a malformed or cut-off request.
    return new AppError(400, 'validation_failed', 'The upload could not be read: the request was malformed or cut off. Try again.');
  }

  /** Multipart parsing of one file (field `file`) into memory, within the size limit; errors become AppErrors. */
  const receive: RequestHandler = (req, res, next) => {
    single(req, res, (err: unknown) => next(err ? uploadError(err) : undefined));
  };

  /** Remove both versions; never throws, so it can clean up after another failure. */
  async function remove(key: string): Promise<void> {
    for (const variant of ['display', 'thumb'] as const) {
      try {
        await rm(fileOf(key, variant), { force: true });
      } catch (err) {
        logger.warn(`could not remove the ${variant} image ${key}`, err);
      }
    }
  }

  /**
   * Prove the bytes are a JPEG, PNG or WebP image within the pixel limit, then write an upright display
   * version and a thumbnail, both without metadata. Throws 400 invalid_image / image_too_large.
   */
  async function save(input: Buffer): Promise<StoredImage> {
    // The header alone (no pixels decoded) tells the format and the claimed size.
    const meta = await sharp(input, { limitInputPixels: false })
      .metadata()
      .catch(() => {
        throw invalidImage('The file is not an image Skewbench can read. Upload a JPEG, PNG or WebP photo.');
      });
    if (!acceptedFormats.has(meta.format)) {
      throw invalidImage(`Only JPEG, PNG and WebP photos are accepted; this file is ${meta.format.toUpperCase()}.`);
    }
    const pixels = meta.width * meta.height;
    if (pixels > config.maxPhotoPixels) {
      const mp = (n: number) => Math.round(n / 100_000) / 10;
      const message = `The image is ${meta.width} × ${meta.height} pixels (${mp(pixels)} megapixels); the most Skewbench accepts is ${mp(config.maxPhotoPixels)} megapixels. Scale it down and try again.`;
      throw new AppError(400, 'image_too_large', message, [{ path: 'file', message }]);
    }

    let display: { data: Buffer; info: OutputInfo };
    let thumb: { data: Buffer; info: OutputInfo };
    try {
      // limitInputPixels again, so the decoder itself refuses a header that lied to metadata().
      // failOn 'error' refuses truncated and corrupt data but tolerates the harmless warnings some cameras cause.
      // rotate() applies the EXIF orientation; the output keeps no EXIF, GPS, XMP, IPTC or ICC data, since
      // withMetadata/keepExif are never called.
      display = await sharp(input, { limitInputPixels: config.maxPhotoPixels, failOn: 'error' })
        .rotate()
        .resize({ width: longestSide.display, height: longestSide.display, fit: 'inside', withoutEnlargement: true })
        .webp({ quality: 82 })
        .toBuffer({ resolveWithObject: true });
      thumb = await sharp(display.data)
        .resize({ width: longestSide.thumb, height: longestSide.thumb, fit: 'inside', withoutEnlargement: true })
        .webp({ quality: 75 })
        .toBuffer({ resolveWithObject: true });
    } catch {
      throw invalidImage('The image could not be decoded: it is damaged or cut off. Upload the original file again.');
    }

    const key = randomUUID();
    try {
      await mkdir(dir, { recursive: true });
      // 'wx' never overwrites: a key collision fails loudly instead of replacing another photo.
      await writeFile(fileOf(key, 'display'), display.data, { flag: 'wx' });
      await writeFile(fileOf(key, 'thumb'), thumb.data, { flag: 'wx' });
    } catch (err) {
      await remove(key);
      throw err;
    }
    return {
      key,
      width: display.info.width,
      height: display.info.height,
      bytes: display.info.size,
      thumbWidth: thumb.info.width,
      thumbHeight: thumb.info.height,
    };
  }

  /** The bytes of one stored version; 404 when the file is gone. */
  async function read(key: string, variant: ImageVariant): Promise<Buffer> {
    try {
      return await readFile(fileOf(key, variant));
    } catch (err) {
      if ((err as NodeJS.ErrnoException).code === 'ENOENT') throw notFound('The image file');
      throw err;
    }
  }

  return { receive, save, remove, read, contentType: storedImageType };
}

export type ImageStore = ReturnType<typeof createImageStore>;
