/**
 * Photos are stored per workshop: each workshop's files in a folder of its own under the uploads folder, read only
 * through that workshop's own rows. Another workshop's photo id is a 404 for every file route (working copy,
 * thumbnail, original), and a row that pointed at another workshop's file would still not reach it.
 */
import fs from 'node:fs';
import path from 'node:path';
import pg from 'pg';
import sharp from 'sharp';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { closeTestApp, demoWorkshopId, getTestApp, signIn, signInAs, testDatabaseUrl, type Session } from '../helpers/app';
import { createOtherWorkshop, OTHER_PASSWORD } from '../helpers/workshops';

const { app, sequelize, config } = getTestApp();
const owner = new pg.Client({ connectionString: testDatabaseUrl() });

let demo: Session;
let other: Session;
let otherWorkshop: number;
let demoWorkshop: number;

const post = (s: Session, url: string, body: object) => s.agent.post(url).set('x-csrf-token', s.csrf).send(body);

/** A customer, a piece and one photo in the workshop `s` signs in to. */
async function photoOf(s: Session, name: string): Promise<{ id: number; pieceId: number; url: string; thumbUrl: string }> {
  const c = await post(s, '/api/customers', { name }).expect(201);
  const p = await post(s, '/api/pieces', { customerId: c.body.id, kind: 'upright', description: `Upright of ${name}`, dimensions: { width: '1500 mm' } }).expect(201);
  const png = await sharp({ create: { width: 320, height: 200, channels: 3, background: '#6b4226' } }).png().toBuffer();
  const res = await s.agent.post(`/api/pieces/${p.body.id}/photos`).set('x-csrf-token', s.csrf).attach('photos', png, 'side.png').expect(201);
  return { ...res.body[0], pieceId: p.body.id };
}

beforeAll(async () => {
  await owner.connect();
  demoWorkshop = (await demoWorkshopId(sequelize))!;
  const made = await createOtherWorkshop(sequelize, 'Photo Folder Restorers');
  otherWorkshop = made.id;
  demo = await signInAs(app, 'estimator');
  other = await signIn(app, made.emails.estimator, OTHER_PASSWORD);
});
afterAll(async () => {
  await owner.end();
  await closeTestApp();
});

describe('photos stored per workshop', () => {
  it('keeps each workshop’s files in its own folder', async () => {
    const mine = await photoOf(demo, 'Folder test customer A');
    const theirs = await photoOf(other, 'Folder test customer B');
    const names = async (id: number) =>
      (await owner.query<{ file_name: string; thumb_name: string; work_name: string }>('SELECT file_name, thumb_name, work_name FROM piece_photos WHERE id = $1', [id])).rows[0]!;
    for (const [photo, workshop] of [
      [mine, demoWorkshop],
      [theirs, otherWorkshop],
    ] as const) {
      const row = await names(photo.id);
      for (const name of [row.file_name, row.thumb_name, row.work_name]) {
        expect(name.startsWith(`w${workshop}/`)).toBe(true);
        expect(fs.existsSync(path.join(config.uploadsDir, 'photos', name))).toBe(true);
      }
    }
  });

  it('answers 404 for another workshop’s photo id on every file route, and the file is untouched', async () => {
    const theirs = await photoOf(other, 'Folder test customer C');
    for (const url of [theirs.url, theirs.thumbUrl, `/api/photos/${theirs.id}/original`]) {
      await other.agent.get(url).expect(200);
      const res = await demo.agent.get(url);
      expect(res.status, url).toBe(404);
    }
    const del = await demo.agent.delete(`/api/photos/${theirs.id}`).set('x-csrf-token', demo.csrf);
    expect(del.status).toBe(404);
    await other.agent.get(theirs.url).expect(200);
  });

  it('does not serve another workshop’s file even through a row that names it', async () => {
    const theirs = await photoOf(other, 'Folder test customer D');
    const mine = await photoOf(demo, 'Folder test customer E');
    // A row of the demo workshop made to point at the other workshop's files (as only the owner could).
    const { rows } = await owner.query<{ file_name: string; thumb_name: string; work_name: string }>('SELECT file_name, thumb_name, work_name FROM piece_photos WHERE id = $1', [theirs.id]);
    await owner.query('UPDATE piece_photos SET file_name = $1, thumb_name = $2, work_name = $3 WHERE id = $4', [rows[0]!.file_name, rows[0]!.thumb_name, rows[0]!.work_name, mine.id]);
    for (const url of [mine.url, mine.thumbUrl, `/api/photos/${mine.id}/original`]) {
      const res = await demo.agent.get(url);
      expect(res.status, url).toBe(404);
    }
  });
});
