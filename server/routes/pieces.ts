import multer from 'multer';
import type { Sequelize } from 'sequelize';
import { z } from 'zod';
import { IdSchema, PHOTO_LIMITS, PhotoCaptionSchema, PieceInputSchema, PieceListQuerySchema } from '@shared/schemas/customers';
import type { Config } from '../config';
import { secureRouter, type RouteInfo } from '../http/guard';
import { multipart } from '../http/input';
import { parseOr400, problems } from '../http/problem';
import { Estimate, Job } from '../models';
import { addPhotos, deletePhoto, photoFile, updateCaption } from '../services/photos';
import { createPiece, getPiece, listPieces, updatePiece } from '../services/pieces';

const IdParam = z.object({ id: IdSchema });

export function pieceRoutes(config: Config, sequelize: Sequelize, table: RouteInfo[]) {
  const upload = multer({
    storage: multer.memoryStorage(),
    limits: { fileSize: PHOTO_LIMITS.maxBytes, files: PHOTO_LIMITS.maxFiles, fields: 40, fieldSize: 4096 },
  });

  const r = secureRouter('/api/pieces', table);
  r.get('', 'signed-in', async (req, res) => {
    res.json(await listPieces(parseOr400(PieceListQuerySchema, req.query)));
  });
  r.post('', 'editPieces', async (req, res) => {
    res.status(201).json(await createPiece(sequelize, req.user!.id, parseOr400(PieceInputSchema, req.body)));
  });
  r.get('/:id', 'signed-in', async (req, res) => {
    res.json(await getPiece(parseOr400(IdParam, req.params).id));
  });
  r.patch('/:id', 'editPieces', async (req, res) => {
    const { id } = parseOr400(IdParam, req.params);
    res.json(await updatePiece(sequelize, req.user!.id, id, parseOr400(PieceInputSchema.partial(), req.body)));
  });
  r.post('/:id/photos', 'editPieces', ...multipart(upload.array('photos', PHOTO_LIMITS.maxFiles), 'photos'), async (req, res) => {
    const { id } = parseOr400(IdParam, req.params);
    const files = (req.files as Express.Multer.File[] | undefined) ?? [];
    const raw = (req.body as Record<string, unknown> | undefined)?.captions;
    const captions = Array.isArray(raw) ? raw.map(String) : raw === undefined ? [] : [String(raw)];
    res.status(201).json(await addPhotos(sequelize, config.uploadsDir, req.user!.id, id, files, captions));
  });

  const p = secureRouter('/api/photos', table);
  p.patch('/:id', 'editPieces', async (req, res) => {
    const { id } = parseOr400(IdParam, req.params);
    res.json(await updateCaption(sequelize, req.user!.id, id, parseOr400(PhotoCaptionSchema, req.body).caption));
  });
  p.delete('/:id', 'editPieces', async (req, res) => {
    await deletePhoto(sequelize, config.uploadsDir, req.user!.id, parseOr400(IdParam, req.params).id);
    res.status(204).end();
  });
  // file: the bounded working copy pages show; thumb: for lists; original: the upload as sent, as a download.
  for (const which of ['file', 'thumb', 'original'] as const) {
    p.get(`/:id/${which}`, 'signed-in', async (req, res) => {
      const file = await photoFile(config.uploadsDir, parseOr400(IdParam, req.params).id, which);
      res.setHeader('Cache-Control', 'private, max-age=86400, immutable');
      if (which === 'original') res.setHeader('Content-Disposition', 'attachment');
      res.type(file.mime).sendFile(file.path, { dotfiles: 'allow' });
    });
  }
  // A photo taken at the bench while marking a session done: it joins the photos of the job's piece.
  const j = secureRouter('/api/jobs', table);
  j.post('/:id/photos', 'recordProgress', upload.array('photos', PHOTO_LIMITS.maxFiles), async (req, res) => {
    const { id } = parseOr400(IdParam, req.params);
    const job = await Job.findByPk(id, { attributes: ['id', 'estimateId'] });
    if (!job) throw problems.notFound('Job');
    const estimate = await Estimate.findByPk(job.estimateId, { attributes: ['id', 'pieceId'] });
    if (!estimate) throw problems.notFound('Estimate');
    const files = (req.files as Express.Multer.File[] | undefined) ?? [];
    const raw = (req.body as Record<string, unknown> | undefined)?.captions;
    const captions = Array.isArray(raw) ? raw.map(String) : raw === undefined ? [] : [String(raw)];
    res.status(201).json(await addPhotos(sequelize, config.uploadsDir, req.user!.id, estimate.pieceId, files, captions));
  });
  return [r.router, p.router, j.router];
}
