import multer from 'multer';
import type { Sequelize } from 'sequelize';
import { z } from 'zod';
import { IdSchema, PHOTO_LIMITS } from '@shared/schemas/customers';
import {
  CustodyMoveSchema,
  JobLogisticsSchema,
  JobNoteSchema,
  KeepPolisherSchema,
  PhotoPhaseSchema,
  PhotoShareSchema,
  VariationAnswerSchema,
  VariationInputSchema,
} from '@shared/schemas/job-end';
import type { Config } from '../config';
import { secureRouter, type RouteInfo } from '../http/guard';
import { multipart } from '../http/input';
import { parseOr400 } from '../http/problem';
import {
  addNote,
  addProgressPhotos,
  answerVariation,
  createVariation,
  getJobEnd,
  keepPolisher,
  moveJobCustody,
  publicJobs,
  publicPhotoFile,
  publicVariation,
  sendVariation,
  setLogistics,
  sharePhoto,
  withdrawVariation,
} from '../services/job-end';
import { publicLinkLimiter } from '../http/public-limit';

const IdParam = z.object({ id: IdSchema });
const PhotoParam = z.object({ id: IdSchema, photoId: IdSchema });
const VariationParam = z.object({ id: IdSchema, variationId: IdSchema });
const TokenParam = z.object({ token: z.string().min(10).max(200) });
const PublicPhotoParam = z.object({ token: z.string().min(10).max(200), photoId: IdSchema });

/** The job's end for staff (collection, return, the piece's state, the kept hand, notes, photos, variations) and the customer's side. */
export function jobEndRoutes(config: Config, sequelize: Sequelize, table: RouteInfo[]) {
  const upload = multer({
    storage: multer.memoryStorage(),
    limits: { fileSize: PHOTO_LIMITS.maxBytes, files: PHOTO_LIMITS.maxFiles, fields: 40, fieldSize: 4096 },
  });
  const j = secureRouter('/api/jobs', table);
  j.get('/:id/end', 'signed-in', async (req, res) => {
    res.json(await getJobEnd(parseOr400(IdParam, req.params).id));
  });
  j.put('/:id/logistics', 'planRoom', async (req, res) => {
    const { id } = parseOr400(IdParam, req.params);
    res.json(await setLogistics(sequelize, req.user!.id, id, parseOr400(JobLogisticsSchema, req.body)));
  });
  j.post('/:id/custody', 'planRoom', async (req, res) => {
    const { id } = parseOr400(IdParam, req.params);
    res.json(await moveJobCustody(sequelize, req.user!.id, id, parseOr400(CustodyMoveSchema, req.body).event));
  });
  j.put('/:id/keep', 'planRoom', async (req, res) => {
    const { id } = parseOr400(IdParam, req.params);
    res.json(await keepPolisher(sequelize, req.user!.id, id, parseOr400(KeepPolisherSchema, req.body)));
  });
  j.post('/:id/notes', 'signed-in', async (req, res) => {
    const { id } = parseOr400(IdParam, req.params);
    res.status(201).json(await addNote(sequelize, req.user!.id, id, parseOr400(JobNoteSchema, req.body).body));
  });
  j.post('/:id/progress-photos', 'recordProgress', ...multipart(upload.array('photos', PHOTO_LIMITS.maxFiles), 'photos'), async (req, res) => {
    const { id } = parseOr400(IdParam, req.params);
    const body = (req.body as Record<string, unknown> | undefined) ?? {};
    const phase = parseOr400(z.object({ phase: PhotoPhaseSchema }), { phase: body.phase }).phase;
    const files = (req.files as Express.Multer.File[] | undefined) ?? [];
    const raw = body.captions;
    const captions = Array.isArray(raw) ? raw.map(String) : raw === undefined ? [] : [String(raw)];
    res.status(201).json(await addProgressPhotos(sequelize, config.uploadsDir, req.user!.id, id, phase, files, captions));
  });
  j.put('/:id/progress-photos/:photoId/shared', 'recordProgress', async (req, res) => {
    const { id, photoId } = parseOr400(PhotoParam, req.params);
    res.json(await sharePhoto(sequelize, req.user!.id, id, photoId, parseOr400(PhotoShareSchema, req.body).shared));
  });
  j.post('/:id/variations', 'proposeVariations', async (req, res) => {
    const { id } = parseOr400(IdParam, req.params);
    res.status(201).json(await createVariation(sequelize, req.user!.id, id, parseOr400(VariationInputSchema, req.body)));
  });
  j.post('/:id/variations/:variationId/send', 'proposeVariations', async (req, res) => {
    const { id, variationId } = parseOr400(VariationParam, req.params);
    res.json(await sendVariation(sequelize, config, req.user!.id, id, variationId));
  });
  j.post('/:id/variations/:variationId/withdraw', 'proposeVariations', async (req, res) => {
    const { id, variationId } = parseOr400(VariationParam, req.params);
    res.json(await withdrawVariation(sequelize, req.user!.id, id, variationId));
  });

  const limiter = publicLinkLimiter();
  // The customer's side, through the quote's signed link: where the job is and the photos staff shared.
  const q = secureRouter('/api/public/quotes', table);
  q.get('/:token/jobs', 'public', limiter, async (req, res) => {
    res.setHeader('Cache-Control', 'no-store');
    res.json(await publicJobs(config, parseOr400(TokenParam, req.params).token));
  });
  for (const which of ['file', 'thumb'] as const) {
    q.get(`/:token/photos/:photoId/${which}`, 'public', limiter, async (req, res) => {
      const { token, photoId } = parseOr400(PublicPhotoParam, req.params);
      const file = await publicPhotoFile(config, config.uploadsDir, token, photoId, which);
      res.setHeader('Cache-Control', 'private, no-store');
      res.type(file.mime).sendFile(file.path, { dotfiles: 'allow' });
    });
  }
  // A variation's own signed link: read it, approve it, decline it.
  const v = secureRouter('/api/public/variations', table);
  v.get('/:token', 'public', limiter, async (req, res) => {
    res.setHeader('Cache-Control', 'no-store');
    res.json(await publicVariation(config, parseOr400(TokenParam, req.params).token));
  });
  for (const answer of ['approve', 'decline'] as const) {
    v.post(`/:token/${answer}`, 'public', limiter, async (req, res) => {
      const { token } = parseOr400(TokenParam, req.params);
      res.json(await answerVariation(sequelize, config, token, answer, parseOr400(VariationAnswerSchema, req.body ?? {}).note, req.ip ?? ''));
    });
  }
  return [j.router, q.router, v.router];
}
