/**
 * The piece's side of a job: collection and return (dates and arrangements), where the piece is (moves by the state
 * table), the hand kept on the job, staff notes and progress photos. Each change runs in one transaction, is audited,
 * and records a job event when the customer may hear of it (server/services/job-events.ts).
 */
import { type Sequelize, type Transaction } from 'sequelize';
import { moveCustody, type CustodyEvent } from '@shared/schemas/state-moves';
import {
  CUSTODY_SENTENCES,
  type JobEndDto,
  type JobNoteDto,
  type KeepPolisherInput,
  type KeepScope,
  type ProgressPhotoDto,
  type PublicJobDto,
  type PhotoPhase,
  type JobLogisticsSchema,
  type JobCustody,
} from '@shared/schemas/job-end';
import { today } from '@shared/time';
import type { z } from 'zod';
import type { Config } from '../../config';
import { HttpProblem, problems } from '../../http/problem';
import { Estimate, Job, JobEvent, JobNote, JobVariation, PiecePhoto, Polisher, Quote, User } from '../../models';
import { audit } from '../audit';
import { eventText, recordJobEvent } from '../job-events';
import { addPhotos, photoFile, type UploadedFile } from '../photos';
import { hashToken, tokenSigned } from '../quotes/links';
import { variationDto } from './variation-dto';

type Logistics = z.output<typeof JobLogisticsSchema>;

async function lockJob(id: number, transaction: Transaction): Promise<Job> {
  const job = await Job.findByPk(id, { transaction, lock: transaction.LOCK.UPDATE });
  if (!job) throw problems.notFound('Job');
  return job;
}

function photoDto(p: PiecePhoto): ProgressPhotoDto {
  return {
    id: p.id,
    phase: (p.phase ?? 'during') as PhotoPhase,
    caption: p.caption,
    shared: p.shared,
    url: `/api/photos/${p.id}/file`,
    thumbUrl: `/api/photos/${p.id}/thumb`,
    createdAt: p.createdAt.toISOString(),
  };
}

/** Everything about the job's end for the staff page. */
export async function getJobEnd(id: number, transaction?: Transaction): Promise<JobEndDto> {
  const job = await Job.findByPk(id, { transaction });
  if (!job) throw problems.notFound('Job');
  const [notes, photos, variations, events, polisher, quote] = await Promise.all([
    JobNote.findAll({ where: { jobId: id }, order: [['createdAt', 'DESC'], ['id', 'DESC']], limit: 500, transaction }),
    PiecePhoto.findAll({ where: { jobId: id }, order: [['createdAt', 'ASC'], ['id', 'ASC']], transaction }),
    JobVariation.findAll({ where: { jobId: id }, order: [['id', 'ASC']], transaction }),
    JobEvent.findAll({ where: { jobId: id }, order: [['id', 'DESC']], limit: 200, transaction }),
    job.keptPolisherId === null ? null : Polisher.findByPk(job.keptPolisherId, { attributes: ['id', 'name'], transaction }),
    Quote.findByPk(job.quoteId, { attributes: ['id', 'currency'], transaction }),
  ]);
  const authorIds = [...new Set(notes.map((n) => n.authorId).filter((a): a is number => a !== null))];
  const authors = new Map((authorIds.length ? await User.findAll({ where: { id: authorIds }, attributes: ['id', 'name'], transaction }) : []).map((u) => [u.id, u.name]));
  return {
    jobId: job.id,
    number: job.number,
    custody: job.custody,
    collectionDate: job.collectionDate ?? null,
    collectionArrangement: job.collectionArrangement,
    returnDate: job.returnDate ?? null,
    returnArrangement: job.returnArrangement,
    collectedOn: job.collectedOn ?? null,
    completedOn: job.completedOn ?? null,
    returnedOn: job.returnedOn ?? null,
    keep: polisher && job.keepScope ? { polisher: { id: polisher.id, name: polisher.name }, scope: job.keepScope } : null,
    notes: notes.map((n) => noteDto(n, authors)),
    photos: photos.map(photoDto),
    variations: variations.map((v) => variationDto(v, quote?.currency ?? 'GBP', true)),
    events: events.map((e) => ({ id: e.id, kind: e.kind, text: eventText(e.kind, e.detail), at: e.createdAt.toISOString() })),
  };
}

function noteDto(n: JobNote, authors: ReadonlyMap<number, string>): JobNoteDto {
  return { id: n.id, body: n.body, author: n.authorId === null ? null : { id: n.authorId, name: authors.get(n.authorId) ?? 'former user' }, createdAt: n.createdAt.toISOString() };
}

/** Sets the collection and return dates and arrangements; a change of dates is an event the customer hears of. */
export async function setLogistics(sequelize: Sequelize, actorId: number, id: number, input: Logistics): Promise<JobEndDto> {
  await sequelize.transaction(async (transaction) => {
    const job = await lockJob(id, transaction);
    if (job.state === 'cancelled') throw problems.conflict('job_closed', `Job ${job.number} is cancelled.`);
    const before = { collectionDate: job.collectionDate ?? null, collectionArrangement: job.collectionArrangement, returnDate: job.returnDate ?? null, returnArrangement: job.returnArrangement };
    const after = {
      collectionDate: input.collectionDate === undefined ? before.collectionDate : input.collectionDate,
      collectionArrangement: input.collectionArrangement ?? before.collectionArrangement,
      returnDate: input.returnDate === undefined ? before.returnDate : input.returnDate,
      returnArrangement: input.returnArrangement ?? before.returnArrangement,
    };
    if (after.collectionDate && after.returnDate && after.returnDate < after.collectionDate) {
      throw problems.badRequest('dates_out_of_order', `returnDate: must be on or after the collection date (${after.collectionDate})`, 'returnDate');
    }
    await job.update(after, { transaction });
    await audit({ userId: actorId, action: 'job.logistics', entityType: 'job', entityId: id, before, after }, transaction);
    if (before.collectionDate !== after.collectionDate || before.returnDate !== after.returnDate) {
      await recordJobEvent(transaction, id, 'dates-changed', { collectionDate: after.collectionDate, returnDate: after.returnDate, before: { collectionDate: before.collectionDate, returnDate: before.returnDate } }, actorId);
    }
  });
  return getJobEnd(id);
}

const CUSTODY_EVENT_KIND = { arrive: 'arrived', ready: 'ready', return: 'returned', reopen: 'reopened' } as const;

/** Moves the piece by the state table (409 for a move it does not hold), with the day it happened. */
export async function moveJobCustody(sequelize: Sequelize, actorId: number, id: number, event: CustodyEvent): Promise<JobEndDto> {
  await sequelize.transaction(async (transaction) => {
    const job = await lockJob(id, transaction);
    if (job.state === 'cancelled') throw problems.conflict('job_closed', `Job ${job.number} is cancelled.`);
    const to = moveCustody(job.custody, event);
    const day = today();
    const dated =
      event === 'arrive' ? { collectedOn: day } : event === 'ready' ? { completedOn: day } : event === 'return' ? { returnedOn: day } : { completedOn: null };
    const before = { custody: job.custody };
    await job.update({ custody: to, ...dated }, { transaction });
    await audit({ userId: actorId, action: `job.${event}`, entityType: 'job', entityId: id, before, after: { custody: to, ...dated } }, transaction);
    await recordJobEvent(transaction, id, CUSTODY_EVENT_KIND[event], { custody: to, on: day, returnDate: job.returnDate ?? null, returnArrangement: job.returnArrangement }, actorId);
  });
  return getJobEnd(id);
}

/** Keeps a polisher on the job or its bodying (booking then gives those sessions to no one else), or lets go. */
export async function keepPolisher(sequelize: Sequelize, actorId: number, id: number, input: { polisherId: number | null; scope: KeepScope }): Promise<JobEndDto> {
  await sequelize.transaction(async (transaction) => {
    const job = await lockJob(id, transaction);
    if (input.polisherId !== null) {
      const p = await Polisher.findByPk(input.polisherId, { transaction });
      if (!p || !p.active) throw problems.badRequest('unknown_polisher', 'polisherId: not one of the active polishers', 'polisherId');
    }
    const before = { keptPolisherId: job.keptPolisherId ?? null, keepScope: job.keepScope ?? null };
    const after = input.polisherId === null ? { keptPolisherId: null, keepScope: null } : { keptPolisherId: input.polisherId, keepScope: input.scope };
    await job.update(after, { transaction });
    await audit({ userId: actorId, action: 'job.keep', entityType: 'job', entityId: id, before, after }, transaction);
  });
  return getJobEnd(id);
}
export type { KeepPolisherInput };

export async function addNote(sequelize: Sequelize, actorId: number, id: number, body: string): Promise<JobNoteDto> {
  return sequelize.transaction(async (transaction) => {
    const job = await Job.findByPk(id, { attributes: ['id'], transaction });
    if (!job) throw problems.notFound('Job');
    const note = await JobNote.create({ jobId: id, authorId: actorId, body }, { transaction });
    await audit({ userId: actorId, action: 'job.note', entityType: 'job', entityId: id, after: { note: note.id } }, transaction);
    const author = await User.findByPk(actorId, { attributes: ['id', 'name'], transaction });
    return noteDto(note, new Map(author ? [[author.id, author.name]] : []));
  });
}

/** Progress photos: stored like every piece photo (checked with sharp, working copy and thumbnail), kept with the job. */
export async function addProgressPhotos(sequelize: Sequelize, uploadsDir: string, actorId: number, id: number, phase: PhotoPhase, files: UploadedFile[], captions: string[]): Promise<ProgressPhotoDto[]> {
  const job = await Job.findByPk(id, { attributes: ['id', 'estimateId'] });
  if (!job) throw problems.notFound('Job');
  const estimate = await Estimate.findByPk(job.estimateId, { attributes: ['id', 'pieceId'] });
  if (!estimate) throw problems.notFound('Estimate');
  const added = await addPhotos(sequelize, uploadsDir, actorId, estimate.pieceId, files, captions, { jobId: id, phase });
  const rows = await PiecePhoto.findAll({ where: { id: added.map((p) => p.id) }, order: [['id', 'ASC']] });
  return rows.map(photoDto);
}

/** Shares a progress photo on the customer's page, or stops sharing it. */
export async function sharePhoto(sequelize: Sequelize, actorId: number, jobId: number, photoId: number, shared: boolean): Promise<ProgressPhotoDto> {
  return sequelize.transaction(async (transaction) => {
    const photo = await PiecePhoto.findOne({ where: { id: photoId, jobId }, transaction, lock: transaction.LOCK.UPDATE });
    if (!photo) throw problems.notFound('Photo');
    await photo.update({ shared }, { transaction });
    await audit({ userId: actorId, action: shared ? 'photo.share' : 'photo.unshare', entityType: 'job', entityId: jobId, after: { photo: photoId, shared } }, transaction);
    return photoDto(photo);
  });
}

// -------------------------------------------------------------------------------------------- the customer

const linkInvalid = () => new HttpProblem(404, 'link_invalid', 'Link not valid', 'This link is not valid. Check that the whole address was copied, or ask the workshop for a new link.');

/** The quote a customer's link opens (the same signed link as the quote's). */
export async function quoteOfLink(config: Config, token: string): Promise<Quote> {
  if (!tokenSigned(token, config.linkSecret)) throw linkInvalid();
  const quote = await Quote.findOne({ where: { tokenHash: hashToken(token) } });
  if (!quote || quote.state === 'draft') throw linkInvalid();
  return quote;
}

/** Where each job of the customer's agreement is, in plain words, with the photos staff chose to share. */
export async function publicJobs(config: Config, token: string): Promise<PublicJobDto[]> {
  const quote = await quoteOfLink(config, token);
  const jobs = await Job.findAll({ where: { quoteId: quote.id }, order: [['id', 'ASC']] });
  const live = jobs.filter((j) => j.state !== 'cancelled');
  if (live.length === 0) return [];
  const ids = live.map((j) => j.id);
  const [photos, variations] = await Promise.all([
    PiecePhoto.findAll({ where: { jobId: ids, shared: true }, order: [['createdAt', 'ASC'], ['id', 'ASC']] }),
    JobVariation.findAll({ where: { jobId: ids, state: ['sent', 'approved', 'declined'] }, order: [['id', 'ASC']] }),
  ]);
  const base = `/api/public/quotes/${encodeURIComponent(token)}/photos`;
  return live.map((j) => ({
    number: j.number,
    title: j.title,
    custody: j.custody,
    where: CUSTODY_SENTENCES[j.custody as JobCustody],
    collectionDate: j.collectionDate ?? null,
    collectionArrangement: j.collectionArrangement,
    returnDate: j.returnDate ?? null,
    returnArrangement: j.returnArrangement,
    completedOn: j.completedOn ?? null,
    photos: photos
      .filter((p) => p.jobId === j.id)
      .map((p) => ({ id: p.id, phase: (p.phase ?? 'during') as PhotoPhase, caption: p.caption, url: `${base}/${p.id}/file`, thumbUrl: `${base}/${p.id}/thumb` })),
    variations: variations
      .filter((v) => v.jobId === j.id)
      .map((v) => ({ title: v.title, description: v.description, price: Number(v.price).toFixed(2), currency: quote.currency, state: v.state })),
  }));
}

/** A shared photo's file through the customer's link: only photos of that agreement's jobs that staff shared. */
export async function publicPhotoFile(config: Config, uploadsDir: string, token: string, photoId: number, which: 'file' | 'thumb'): Promise<{ path: string; mime: string }> {
  const quote = await quoteOfLink(config, token);
  const photo = await PiecePhoto.findOne({ where: { id: photoId, shared: true }, attributes: ['id', 'jobId'] });
  const job = photo?.jobId ? await Job.findOne({ where: { id: photo.jobId, quoteId: quote.id }, attributes: ['id'] }) : null;
  if (!photo || !job) throw problems.notFound('Photo');
  return photoFile(uploadsDir, photo.id, which);
}
