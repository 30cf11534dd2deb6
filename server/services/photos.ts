/**
 * Condition photos of a piece: checked by their bytes (JPEG, PNG or WebP, decoded, not trusted by name), stored
 * under the uploads folder with random names, with a thumbnail for lists.
 */
import { randomBytes } from 'node:crypto';
import fs from 'node:fs/promises';
import path from 'node:path';
import sharp from 'sharp';
import type { Sequelize } from 'sequelize';
import { PHOTO_LIMITS, type Photo as PhotoDto } from '@shared/schemas/customers';
import { HttpProblem, problems } from '../http/problem';
import { Piece, PiecePhoto } from '../models';
import { audit } from './audit';

const FORMATS: Record<string, { mime: string; ext: string }> = {
  jpeg: { mime: 'image/jpeg', ext: 'jpg' },
  png: { mime: 'image/png', ext: 'png' },
  webp: { mime: 'image/webp', ext: 'webp' },
};
/** Refuse images so large they could exhaust memory when decoded. */
const MAX_PIXELS = 60_000_000;

export function photoDto(p: PiecePhoto): PhotoDto {
  return {
    id: p.id,
    pieceId: p.pieceId,
    caption: p.caption,
    url: `/api/photos/${p.id}/file`,
    thumbUrl: `/api/photos/${p.id}/thumb`,
    width: p.width,
    height: p.height,
    bytes: p.bytes,
    createdAt: p.createdAt.toISOString(),
  };
}

export interface UploadedFile {
  originalname: string;
  buffer: Buffer;
}

function photosDir(uploadsDir: string): string {
  return path.join(uploadsDir, 'photos');
}

/** The path of a stored file; names come from the database and are checked, never taken from a request. */
export function storedPath(uploadsDir: string, name: string): string {
  if (!/^[0-9a-f]{32}(-thumb)?\.(jpg|png|webp)$/.test(name)) throw new Error(`bad stored file name ${name}`);
  return path.join(photosDir(uploadsDir), name);
}

interface Checked {
  file: UploadedFile;
  mime: string;
  ext: string;
  width: number;
  height: number;
  thumb: Buffer;
}

async function check(file: UploadedFile, index: number): Promise<Checked> {
  const reject = (why: string) =>
    new HttpProblem(400, 'unsupported_image', 'Not a usable image', `photos[${index}] (${file.originalname}): ${why}`, {
      field: 'photos',
      errors: [{ field: 'photos', message: `${file.originalname}: ${why}` }],
    });
  let meta: sharp.Metadata;
  try {
    meta = await sharp(file.buffer, { limitInputPixels: MAX_PIXELS }).metadata();
  } catch {
    throw reject('is not a JPEG, PNG or WebP image');
  }
  const format = meta.format ? FORMATS[meta.format] : undefined;
  if (!format || !meta.width || !meta.height) throw reject(`is a ${meta.format ?? 'unknown'} file; only JPEG, PNG and WebP are accepted`);
  // Decoding the whole image for the thumbnail also proves the file is not damaged past its header.
  let thumb: Buffer;
  try {
    thumb = await sharp(file.buffer, { limitInputPixels: MAX_PIXELS })
      .rotate()
      .resize({ width: 480, height: 480, fit: 'inside', withoutEnlargement: true })
      .webp({ quality: 78 })
      .toBuffer();
  } catch {
    throw reject('is damaged: the image cannot be read');
  }
  return { file, mime: format.mime, ext: format.ext, width: meta.width, height: meta.height, thumb };
}

/** Stores several photos at once: all are checked first; files are written, then rows in one transaction. */
export async function addPhotos(sequelize: Sequelize, uploadsDir: string, actorId: number, pieceId: number, files: UploadedFile[], captions: string[]): Promise<PhotoDto[]> {
  if (!(await Piece.findByPk(pieceId))) throw problems.notFound('Piece');
  if (files.length === 0) throw problems.badRequest('no_files', 'photos: choose at least one image', 'photos');
  if (files.length > PHOTO_LIMITS.maxFiles) throw problems.badRequest('too_many_files', `photos: at most ${PHOTO_LIMITS.maxFiles} at once`, 'photos');
  const checked = await Promise.all(files.map((f, i) => check(f, i)));
  await fs.mkdir(photosDir(uploadsDir), { recursive: true });
  const written: string[] = [];
  try {
    const stored: { c: Checked; fileName: string; thumbName: string }[] = [];
    for (const c of checked) {
      const base = randomBytes(16).toString('hex');
      const fileName = `${base}.${c.ext}`;
      const thumbName = `${base}-thumb.webp`;
      await fs.writeFile(storedPath(uploadsDir, fileName), c.file.buffer, { flag: 'wx' });
      written.push(fileName);
      await fs.writeFile(storedPath(uploadsDir, thumbName), c.thumb, { flag: 'wx' });
      written.push(thumbName);
      stored.push({ c, fileName, thumbName });
    }
    return await sequelize.transaction(async (transaction) => {
      const rows = [];
      for (const [i, s] of stored.entries()) {
        rows.push(
          await PiecePhoto.create(
            {
              pieceId,
              fileName: s.fileName,
              thumbName: s.thumbName,
              mime: s.c.mime,
              bytes: s.c.file.buffer.length,
              width: s.c.width,
              height: s.c.height,
              caption: (captions[i] ?? '').trim().slice(0, 300),
              createdBy: actorId,
            },
            { transaction },
          ),
        );
      }
      await audit({ userId: actorId, action: 'photo.add', entityType: 'piece', entityId: pieceId, after: { photos: rows.map((r) => r.id) } }, transaction);
      return rows.map(photoDto);
    });
  } catch (err) {
    await Promise.all(written.map((name) => fs.rm(storedPath(uploadsDir, name), { force: true })));
    throw err;
  }
}

export async function updateCaption(sequelize: Sequelize, actorId: number, id: number, caption: string): Promise<PhotoDto> {
  return sequelize.transaction(async (transaction) => {
    const photo = await PiecePhoto.findByPk(id, { transaction });
    if (!photo) throw problems.notFound('Photo');
    const before = photo.caption;
    await photo.update({ caption }, { transaction });
    await audit({ userId: actorId, action: 'photo.caption', entityType: 'photo', entityId: id, before: { caption: before }, after: { caption } }, transaction);
    return photoDto(photo);
  });
}

export async function deletePhoto(sequelize: Sequelize, uploadsDir: string, actorId: number, id: number): Promise<void> {
  const photo = await sequelize.transaction(async (transaction) => {
    const p = await PiecePhoto.findByPk(id, { transaction });
    if (!p) throw problems.notFound('Photo');
    await p.destroy({ transaction });
    await audit({ userId: actorId, action: 'photo.delete', entityType: 'piece', entityId: p.pieceId, before: { photo: id, caption: p.caption } }, transaction);
    return p;
  });
  // The row is gone; the files follow (a leftover file is harmless, a row without its file is not).
  await Promise.all([photo.fileName, photo.thumbName].map((name) => fs.rm(storedPath(uploadsDir, name), { force: true })));
}

export async function photoFile(uploadsDir: string, id: number, which: 'file' | 'thumb'): Promise<{ path: string; mime: string }> {
  const photo = await PiecePhoto.findByPk(id);
  if (!photo) throw problems.notFound('Photo');
  return which === 'file' ? { path: storedPath(uploadsDir, photo.fileName), mime: photo.mime } : { path: storedPath(uploadsDir, photo.thumbName), mime: 'image/webp' };
}
