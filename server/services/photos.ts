/**
 * Condition photos of a piece: checked by their bytes (JPEG, PNG or WebP, decoded, not trusted by name), stored
 * under the uploads folder with random names: the original as sent, a bounded working copy (JPEG, longest side
 * SHELLWRIGHT_PHOTO_WORKING_PX, default 2048) that pages and PDFs use, and a thumbnail for lists.
 *
 * Limits (read from the environment): one image at most SHELLWRIGHT_PHOTO_MAX_PIXELS (default 50 MP, what a
 * high-resolution camera makes), one request at most SHELLWRIGHT_PHOTO_REQUEST_PIXELS in all (default 150 MP, a
 * dozen 12 MP phone photos). Sizes are read from the headers before anything is decoded, and images are decoded one
 * at a time through the image-job gate, so one request cannot take the server's threads.
 */
import { randomBytes } from 'node:crypto';
import fs from 'node:fs/promises';
import path from 'node:path';
import sharp from 'sharp';
import type { Sequelize } from 'sequelize';
import { PHOTO_LIMITS, type Photo as PhotoDto } from '@shared/schemas/customers';
import { currentWorkshopId } from '../db/workshop-context';
import { HttpProblem, problems } from '../http/problem';
import { Piece, PiecePhoto } from '../models';
import { audit } from './audit';
import { imageJob } from './image-jobs';

const FORMATS: Record<string, { mime: string; ext: string }> = {
  jpeg: { mime: 'image/jpeg', ext: 'jpg' },
  png: { mime: 'image/png', ext: 'png' },
  webp: { mime: 'image/webp', ext: 'webp' },
};
function intFromEnv(name: string, fallback: number): number {
  const value = Number(process.env[name]);
  return Number.isInteger(value) && value > 0 ? value : fallback;
}

/** The photo limits and the working copy's size, from the environment (see docs/operations.md). */
export const PHOTO_SETTINGS = {
  workingPx: intFromEnv('SHELLWRIGHT_PHOTO_WORKING_PX', 2048),
  maxPixels: intFromEnv('SHELLWRIGHT_PHOTO_MAX_PIXELS', 50_000_000),
  requestPixels: intFromEnv('SHELLWRIGHT_PHOTO_REQUEST_PIXELS', 150_000_000),
};

const megapixels = (px: number) => `${(px / 1_000_000).toFixed(px < 10_000_000 ? 1 : 0)} MP`;

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

/**
 * Each workshop's files live in a folder of its own, `photos/w<id>/`, and a stored name carries that folder
 * (`w12/<hex>.jpg`). Names stored before workshops had folders have none and stay where they were.
 */
function workshopFolder(): string {
  const id = currentWorkshopId();
  if (id === null || id === undefined) throw new Error('photos are stored under a workshop');
  return `w${id}`;
}

/**
 * The path of a stored file; names come from the database and are checked, never taken from a request. A name in
 * another workshop's folder is refused even if a row pointed at it.
 */
export function storedPath(uploadsDir: string, name: string): string {
  const m = /^(?:(w[0-9]+)\/)?[0-9a-f]{32}(-thumb|-work)?\.(jpg|png|webp)$/.exec(name);
  if (!m) throw new Error(`bad stored file name ${name}`);
  if (m[1] && m[1] !== workshopFolder()) throw problems.notFound('Photo');
  return path.join(photosDir(uploadsDir), name);
}

interface Header {
  file: UploadedFile;
  index: number;
  mime: string;
  ext: string;
  width: number;
  height: number;
}

interface Checked extends Header {
  work: Buffer;
  thumb: Buffer;
}

function rejecter(file: UploadedFile, index: number) {
  return (why: string) =>
    new HttpProblem(400, 'unsupported_image', 'Not a usable image', `photos[${index}] (${file.originalname}): ${why}`, {
      field: 'photos',
      errors: [{ field: 'photos', message: `${file.originalname}: ${why}` }],
    });
}

/** Reads an image's format and size from its header only: nothing is decoded yet. */
async function readHeader(file: UploadedFile, index: number): Promise<Header> {
  const reject = rejecter(file, index);
  let meta: sharp.Metadata;
  try {
    meta = await sharp(file.buffer).metadata();
  } catch {
    throw reject('is not a JPEG, PNG or WebP image');
  }
  const format = meta.format ? FORMATS[meta.format] : undefined;
  if (!format || !meta.width || !meta.height) throw reject(`is a ${meta.format ?? 'unknown'} file; only JPEG, PNG and WebP are accepted`);
  const pixels = meta.width * meta.height * Math.max(1, meta.pages ?? 1);
  if (pixels > PHOTO_SETTINGS.maxPixels) {
    throw reject(`is ${meta.width} × ${meta.height} pixels (${megapixels(pixels)}); a photo may have at most ${megapixels(PHOTO_SETTINGS.maxPixels)}`);
  }
  return { file, index, mime: format.mime, ext: format.ext, width: meta.width, height: meta.height };
}

/** The working copy: upright, longest side at most the setting, flattened onto white, as JPEG. */
function workingCopy(input: Buffer): Promise<Buffer> {
  const size = PHOTO_SETTINGS.workingPx;
  return sharp(input, { limitInputPixels: PHOTO_SETTINGS.maxPixels })
    .rotate()
    .resize({ width: size, height: size, fit: 'inside', withoutEnlargement: true })
    .flatten({ background: '#ffffff' })
    .jpeg({ quality: 82 })
    .toBuffer();
}

/** Decodes the whole image (proving it is not damaged past its header) into its working copy and thumbnail. */
async function decode(header: Header): Promise<Checked> {
  try {
    return await imageJob(async () => {
      const work = await workingCopy(header.file.buffer);
      const thumb = await sharp(work).resize({ width: 480, height: 480, fit: 'inside', withoutEnlargement: true }).webp({ quality: 78 }).toBuffer();
      return { ...header, work, thumb };
    });
  } catch {
    throw rejecter(header.file, header.index)('is damaged: the image cannot be read');
  }
}

/** Stores several photos at once: all are checked first; files are written, then rows in one transaction. */
export async function addPhotos(
  sequelize: Sequelize,
  uploadsDir: string,
  actorId: number,
  pieceId: number,
  files: UploadedFile[],
  captions: string[],
  progress?: { jobId: number; phase: 'before' | 'during' | 'after' },
): Promise<PhotoDto[]> {
  if (!(await Piece.findByPk(pieceId))) throw problems.notFound('Piece');
  if (files.length === 0) throw problems.badRequest('no_files', 'photos: choose at least one image', 'photos');
  if (files.length > PHOTO_LIMITS.maxFiles) throw problems.badRequest('too_many_files', `photos: at most ${PHOTO_LIMITS.maxFiles} at once`, 'photos');
  const headers = await Promise.all(files.map((f, i) => readHeader(f, i)));
  const total = headers.reduce((n, h) => n + h.width * h.height, 0);
  if (total > PHOTO_SETTINGS.requestPixels) {
    throw problems.badRequest('too_many_pixels', `photos: these ${files.length} images hold ${megapixels(total)} in all; one upload may hold at most ${megapixels(PHOTO_SETTINGS.requestPixels)}. Send them in smaller groups.`, 'photos');
  }
  // One at a time: a request's images never take more than one image-job slot.
  const checked: Checked[] = [];
  for (const h of headers) checked.push(await decode(h));
  const folder = workshopFolder();
  await fs.mkdir(path.join(photosDir(uploadsDir), folder), { recursive: true });
  const written: string[] = [];
  try {
    const stored: { c: Checked; fileName: string; thumbName: string; workName: string }[] = [];
    for (const c of checked) {
      const base = `${folder}/${randomBytes(16).toString('hex')}`;
      const fileName = `${base}.${c.ext}`;
      const thumbName = `${base}-thumb.webp`;
      const workName = `${base}-work.jpg`;
      for (const [name, bytes] of [[fileName, c.file.buffer], [workName, c.work], [thumbName, c.thumb]] as const) {
        await fs.writeFile(storedPath(uploadsDir, name), bytes, { flag: 'wx' });
        written.push(name);
      }
      stored.push({ c, fileName, thumbName, workName });
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
              workName: s.workName,
              mime: s.c.mime,
              bytes: s.c.file.buffer.length,
              width: s.c.width,
              height: s.c.height,
              caption: (captions[i] ?? '').trim().slice(0, 300),
              createdBy: actorId,
              ...(progress ? { jobId: progress.jobId, phase: progress.phase } : {}),
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
  const names = [photo.fileName, photo.thumbName, ...(photo.workName ? [photo.workName] : [])];
  await Promise.all(names.map((name) => fs.rm(storedPath(uploadsDir, name), { force: true })));
}

/**
 * The working copy's path, made from the original first when the photo predates working copies. Null when the
 * original cannot be read (a missing or damaged file).
 */
export async function workingCopyPath(uploadsDir: string, photo: PiecePhoto): Promise<string | null> {
  if (photo.workName) return storedPath(uploadsDir, photo.workName);
  try {
    const original = await fs.readFile(storedPath(uploadsDir, photo.fileName));
    const work = await imageJob(() => workingCopy(original));
    const workName = photo.fileName.replace(/\.(jpg|png|webp)$/, '-work.jpg');
    await fs.writeFile(storedPath(uploadsDir, workName), work);
    await photo.update({ workName });
    return storedPath(uploadsDir, workName);
  } catch {
    return null;
  }
}

/** A photo's file: the working copy (what pages show), the thumbnail, or the original as uploaded (a download). */
export async function photoFile(uploadsDir: string, id: number, which: 'file' | 'thumb' | 'original'): Promise<{ path: string; mime: string }> {
  const photo = await PiecePhoto.findByPk(id);
  if (!photo) throw problems.notFound('Photo');
  if (which === 'thumb') return { path: storedPath(uploadsDir, photo.thumbName), mime: 'image/webp' };
  if (which === 'original') return { path: storedPath(uploadsDir, photo.fileName), mime: photo.mime };
  const work = await workingCopyPath(uploadsDir, photo);
  if (!work) throw problems.notFound('That photo\u2019s file');
  return { path: work, mime: 'image/jpeg' };
}
