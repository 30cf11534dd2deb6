import sharp from 'sharp';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { EstimateRevision } from '../../server/models';
import { closeTestApp, getTestApp, signInAs, type Session } from '../helpers/app';
import { today as workshopToday } from '../../shared/time';

const { app, sequelize } = getTestApp();
afterAll(closeTestApp);

let estimator: Session;
let sales: Session;
let customerId: number;
let pieceId: number;

const grand = { piece: { template: 'grand', dimensions: { length: '6 ft 3 in' }, species: 'rosewood', veneered: true }, system: 'full-repolish' };

beforeAll(async () => {
  estimator = await signInAs(app, 'estimator');
  sales = await signInAs(app, 'sales');
  const c = await sales.agent.post('/api/customers').set('x-csrf-token', sales.csrf).send({ name: 'Perpetua Hollingsworth', email: 'perpetua@example.com', phone: '01632 960 111' }).expect(201);
  customerId = c.body.id;
  const p = await estimator.agent
    .post('/api/pieces')
    .set('x-csrf-token', estimator.csrf)
    .send({ customerId, kind: 'grand', description: 'Grand in rosewood veneer', maker: 'Brightwater & Sons', year: 1898, dimensions: { length: '6 ft 3 in' } })
    .expect(201);
  pieceId = p.body.id;
});

const post = (s: Session, url: string, body: object) => s.agent.post(url).set('x-csrf-token', s.csrf).send(body);

describe('customers and pieces', () => {
  it('validates a customer and names the field', async () => {
    const res = await post(sales, '/api/customers', { name: '', email: 'nope' });
    expect(res.status).toBe(400);
    expect(JSON.parse(res.text).errors.map((e: { field: string }) => e.field)).toEqual(expect.arrayContaining(['name', 'email']));
  });

  it('a piece must belong to a real customer and the workshop role cannot add one', async () => {
    const res = await post(estimator, '/api/pieces', { customerId: 999999, kind: 'grand', description: 'x' });
    expect(JSON.parse(res.text)).toMatchObject({ status: 400, field: 'customerId' });
    const workshop = await signInAs(app, 'workshop');
    expect((await post(workshop, '/api/pieces', { customerId, kind: 'grand', description: 'x' })).status).toBe(403);
  });

  it('keeps a piece\u2019s year as written, with a sortable best guess, and refuses what is not a year in plain words', async () => {
    const made = await post(estimator, '/api/pieces', { customerId, kind: 'upright', description: 'Upright in walnut', year: 'c. 1830' });
    expect(made.status).toBe(201);
    expect(made.body).toMatchObject({ year: 1830, yearText: 'c. 1830' });
    const decade = await estimator.agent.patch(`/api/pieces/${made.body.id}`).set('x-csrf-token', estimator.csrf).send({ year: '1890s' });
    expect(decade.status).toBe(200);
    expect(decade.body).toMatchObject({ year: 1895, yearText: '1890s' });
    const exact = (await estimator.agent.get(`/api/pieces/${pieceId}`).expect(200)).body;
    expect(exact).toMatchObject({ year: 1898, yearText: '1898' });
    const bad = await post(estimator, '/api/pieces', { customerId, kind: 'upright', description: 'Upright', year: 'long ago' });
    expect(bad.status).toBe(400);
    expect(JSON.parse(bad.text)).toMatchObject({ field: 'year', detail: 'The year must be a year such as 1890, c. 1830, about 1900 or 1890s.' });
    const cleared = await estimator.agent.patch(`/api/pieces/${made.body.id}`).set('x-csrf-token', estimator.csrf).send({ year: '' });
    expect(cleared.body).toMatchObject({ year: null, yearText: null });
  });

  it('pages and searches 10 000 customers on the server', async () => {
    await sequelize.query(
      `INSERT INTO customers (name, email, created_at, updated_at)
       SELECT 'Bulk customer ' || lpad(g::text, 5, '0'), 'bulk' || g || '@example.com', now(), now() FROM generate_series(1, 10000) g`,
    );
    const page = await sales.agent.get('/api/customers?q=Bulk%20customer&sort=name&dir=desc&page=3&pageSize=50').expect(200);
    // The count stops ten pages past the one shown: "more than 600", not a count of all 10 000.
    expect(page.body).toMatchObject({ total: 600, totalCapped: true });
    expect(page.body.rows).toHaveLength(50);
    expect(page.body.rows[0].name).toBe('Bulk customer 09900');
    // Near the end the count reaches the end and is exact.
    const last = await sales.agent.get('/api/customers?q=Bulk%20customer&sort=name&dir=desc&page=195&pageSize=50').expect(200);
    expect(last.body.total).toBe(10_000);
    expect(last.body.totalCapped).toBeUndefined();
    expect(last.body.rows.at(-1).name).toBe('Bulk customer 00251');
    const one = await sales.agent.get('/api/customers?q=customer%2004242').expect(200);
    expect(one.body.rows.map((r: { name: string }) => r.name)).toEqual(['Bulk customer 04242']);
    await sequelize.query("DELETE FROM customers WHERE name LIKE 'Bulk customer %'");
  });
});

describe('condition photos', () => {
  it('takes several images at once, checks their bytes, and makes thumbnails', async () => {
    const png = await sharp({ create: { width: 640, height: 400, channels: 3, background: '#7a4a2a' } }).png().toBuffer();
    const jpg = await sharp({ create: { width: 300, height: 500, channels: 3, background: '#3a2418' } }).jpeg().toBuffer();
    const res = await estimator.agent
      .post(`/api/pieces/${pieceId}/photos`)
      .set('x-csrf-token', estimator.csrf)
      .attach('photos', png, 'lid.png')
      .attach('photos', jpg, 'leg.jpeg')
      .field('captions', 'Lid, crazed finish')
      .field('captions', 'Front leg');
    expect(res.status).toBe(201);
    expect(res.body).toHaveLength(2);
    expect(res.body[0]).toMatchObject({ caption: 'Lid, crazed finish', width: 640, height: 400 });
    const thumb = await estimator.agent.get(res.body[0].thumbUrl).expect(200);
    expect(thumb.headers['content-type']).toBe('image/webp');
    expect((await sharp(thumb.body as Buffer).metadata()).format).toBe('webp');
    const piece = await sales.agent.get(`/api/pieces/${pieceId}`).expect(200);
    expect(piece.body.photos).toHaveLength(2);
  });

  it('rejects a text file renamed to .jpg and saves none of the batch', async () => {
    const before = (await estimator.agent.get(`/api/pieces/${pieceId}`)).body.photos.length;
    const good = await sharp({ create: { width: 10, height: 10, channels: 3, background: '#fff' } }).png().toBuffer();
    const res = await estimator.agent
      .post(`/api/pieces/${pieceId}/photos`)
      .set('x-csrf-token', estimator.csrf)
      .attach('photos', good, 'good.png')
      .attach('photos', Buffer.from('this is not an image at all'), 'sneaky.jpg');
    expect(res.status).toBe(400);
    expect(JSON.parse(res.text)).toMatchObject({ code: 'unsupported_image', field: 'photos' });
    expect(JSON.parse(res.text).detail).toMatch(/sneaky\.jpg/);
    expect((await estimator.agent.get(`/api/pieces/${pieceId}`)).body.photos).toHaveLength(before);
  });

  it('rejects a damaged image whose header looks right', async () => {
    const png = await sharp({ create: { width: 200, height: 200, channels: 3, background: '#a0522d' } }).png().toBuffer();
    const damaged = Buffer.concat([png.subarray(0, 60), Buffer.alloc(200, 0)]);
    const res = await estimator.agent.post(`/api/pieces/${pieceId}/photos`).set('x-csrf-token', estimator.csrf).attach('photos', damaged, 'cut-short.png');
    expect(res.status).toBe(400);
    expect(JSON.parse(res.text)).toMatchObject({ code: 'unsupported_image', field: 'photos' });
  });

  it('keeps the original and a bounded working copy: pages get the working copy, the original is a download', async () => {
    const camera = await sharp({ create: { width: 3000, height: 2000, channels: 3, background: '#5a3a22' } }).jpeg({ quality: 60 }).toBuffer();
    const res = await estimator.agent.post(`/api/pieces/${pieceId}/photos`).set('x-csrf-token', estimator.csrf).attach('photos', camera, 'whole-case.jpg').expect(201);
    expect(res.body[0]).toMatchObject({ width: 3000, height: 2000 });
    const page = await estimator.agent.get(res.body[0].url).expect(200);
    expect(page.headers['content-type']).toBe('image/jpeg');
    const work = await sharp(page.body as Buffer).metadata();
    expect(Math.max(work.width!, work.height!)).toBe(2048);
    const original = await estimator.agent.get(`/api/photos/${res.body[0].id}/original`).expect(200);
    expect(original.headers['content-disposition']).toMatch(/attachment/);
    expect(Buffer.compare(original.body as Buffer, camera)).toBe(0);
  });

  it('refuses an image over the pixel cap, and a request whose images hold too many pixels in all, from their headers', async () => {
    // 9000 × 6000 = 54 MP: more than a camera makes (the cap is 50 MP), though the file is small.
    const huge = await sharp({ create: { width: 9000, height: 6000, channels: 3, background: '#222' } }).jpeg({ quality: 30 }).toBuffer();
    const one = await estimator.agent.post(`/api/pieces/${pieceId}/photos`).set('x-csrf-token', estimator.csrf).attach('photos', huge, 'stitched.jpg');
    expect(one.status).toBe(400);
    expect(JSON.parse(one.text)).toMatchObject({ code: 'unsupported_image', field: 'photos' });
    expect(JSON.parse(one.text).detail).toMatch(/at most 50 MP/);
    // Four 40 MP images: each under the cap, 160 MP together, over the 150 MP a request may hold.
    const big = await sharp({ create: { width: 8000, height: 5000, channels: 3, background: '#333' } }).jpeg({ quality: 30 }).toBuffer();
    const before = (await estimator.agent.get(`/api/pieces/${pieceId}`)).body.photos.length;
    let req = estimator.agent.post(`/api/pieces/${pieceId}/photos`).set('x-csrf-token', estimator.csrf);
    for (let i = 0; i < 4; i++) req = req.attach('photos', big, `part-${i}.jpg`);
    const all = await req;
    expect(all.status).toBe(400);
    expect(JSON.parse(all.text)).toMatchObject({ code: 'too_many_pixels', field: 'photos' });
    expect((await estimator.agent.get(`/api/pieces/${pieceId}`)).body.photos).toHaveLength(before);
  });

  it('rejects an oversize image with 413', async () => {
    const big = Buffer.alloc(9 * 1024 * 1024, 7);
    const res = await estimator.agent.post(`/api/pieces/${pieceId}/photos`).set('x-csrf-token', estimator.csrf).attach('photos', big, 'huge.png');
    expect(res.status).toBe(413);
    expect(JSON.parse(res.text)).toMatchObject({ code: 'file_too_large', field: 'photos' });
  });

  it('edits a caption and deletes a photo', async () => {
    const png = await sharp({ create: { width: 20, height: 20, channels: 3, background: '#000' } }).png().toBuffer();
    const [photo] = (await estimator.agent.post(`/api/pieces/${pieceId}/photos`).set('x-csrf-token', estimator.csrf).attach('photos', png, 'x.png').expect(201)).body;
    await estimator.agent.patch(`/api/photos/${photo.id}`).set('x-csrf-token', estimator.csrf).send({ caption: 'Fall board, ring marks' }).expect(200);
    await estimator.agent.delete(`/api/photos/${photo.id}`).set('x-csrf-token', estimator.csrf).expect(204);
    await estimator.agent.get(photo.url).expect(404);
  });
});

describe('estimates and revisions', () => {
  let id: number;
  let firstTotal: string;

  it('creates an estimate priced by the server', async () => {
    const preview = await post(estimator, '/api/calc/preview', grand).expect(200);
    const res = await post(estimator, '/api/estimates', { customerId, pieceId, input: grand });
    expect(res.status).toBe(201);
    id = res.body.id;
    firstTotal = res.body.total;
    expect(res.body.number).toMatch(/^EST-\d{4}-\d{4,}$/);
    expect(res.body.state).toBe('draft');
    expect(res.body.revisionCount).toBe(1);
    expect(res.body.current.result.totals.price).toBe(preview.body.totals.price);
    expect(res.body.total).toBe(preview.body.totals.price);
    expect(res.body.current.result.cautions.length).toBeGreaterThan(0);
    expect(res.body.validUntil).toMatch(/^\d{4}-\d{2}-\d{2}$/);
  });

  it('ignores a forged total inside the input and refuses one beside it', async () => {
    const forged = await post(estimator, '/api/estimates', { customerId, pieceId, input: { ...grand, totals: { price: '1.00' }, price: { total: '1.00' } } });
    expect(forged.status).toBe(201);
    expect(forged.body.total).toBe(firstTotal);
    const beside = await post(estimator, '/api/estimates', { customerId, pieceId, input: grand, total: '1.00' });
    expect(beside.status).toBe(400);
  });

  it('names the field inside the input when a length is bad', async () => {
    const res = await post(estimator, '/api/estimates', { customerId, pieceId, input: { piece: { template: 'grand', dimensions: { length: '-3 ft' } } } });
    expect(res.status).toBe(400);
    expect(JSON.parse(res.text).field).toBe('input.piece.dimensions.length');
  });

  it('revises into a new revision and keeps the old one as it was', async () => {
    const longer = { ...grand, piece: { ...grand.piece, dimensions: { length: '7 ft' } } };
    const res = await post(estimator, `/api/estimates/${id}/revisions`, { baseRevision: 1, input: longer, note: 'Customer measured again' });
    expect(res.status).toBe(201);
    expect(res.body.revisionCount).toBe(2);
    expect(res.body.revisions.map((r: { number: number }) => r.number)).toEqual([2, 1]);
    expect(Number(res.body.total)).toBeGreaterThan(Number(firstTotal));
    const r1 = await sales.agent.get(`/api/estimates/${id}/revisions/1`).expect(200);
    expect(r1.body.total).toBe(firstTotal);
    expect(r1.body.input.piece.dimensions.length).toBe('6 ft 3 in');
  });

  it('refuses a save based on an old revision with 409 and loses nothing', async () => {
    const res = await post(estimator, `/api/estimates/${id}/revisions`, { baseRevision: 1, input: grand });
    expect(res.status).toBe(409);
    expect(JSON.parse(res.text)).toMatchObject({ code: 'stale_revision' });
    expect(JSON.parse(res.text).detail).toMatch(/Revision 2 was saved by/);
    const detail = await sales.agent.get(`/api/estimates/${id}`).expect(200);
    expect(detail.body.revisionCount).toBe(2);
    expect(await EstimateRevision.count({ where: { estimateId: id } })).toBe(2);
  });

  it('keeps revisions immutable in the database itself', async () => {
    await expect(sequelize.query('UPDATE estimate_revisions SET total = 1 WHERE estimate_id = :id', { replacements: { id } })).rejects.toThrow(/immutable/);
  });

  it('moves between draft and priced, and sales may read but not revise', async () => {
    const priced = await post(estimator, `/api/estimates/${id}/state`, { state: 'priced' }).expect(200);
    expect(priced.body.state).toBe('priced');
    expect((await post(sales, `/api/estimates/${id}/revisions`, { baseRevision: 2, input: grand })).status).toBe(403);
    await sales.agent.get(`/api/estimates/${id}`).expect(200);
  });

  it('lists, searches, filters by state, sorts and pages on the server', async () => {
    const res = await sales.agent.get(`/api/estimates?q=Hollingsworth&state=priced&sort=total&dir=desc`).expect(200);
    expect(res.body.rows.map((r: { id: number }) => r.id)).toContain(id);
    expect(res.body.rows.every((r: { state: string }) => r.state === 'priced')).toBe(true);
    const all = await sales.agent.get('/api/estimates?sort=total&dir=asc&pageSize=100').expect(200);
    const totals = all.body.rows.map((r: { total: string }) => Number(r.total));
    expect([...totals].sort((a, b) => a - b)).toEqual(totals);
    const bad = await sales.agent.get('/api/estimates?state=lost');
    expect(JSON.parse(bad.text).field).toBe('state');
  });

  it("a list row says what the estimate's own page says, and each search column finds it", async () => {
    const detail = await sales.agent.get(`/api/estimates/${id}`).expect(200);
    const { revisions: _revisions, current: _current, ...summary } = detail.body;
    for (const q of [detail.body.number, 'Hollingsworth', 'rosewood veneer', detail.body.title.slice(0, 12)]) {
      const res = await sales.agent.get(`/api/estimates?q=${encodeURIComponent(q)}&pageSize=100`).expect(200);
      expect(res.body.rows.find((r: { id: number }) => r.id === id), q).toEqual(summary);
    }
    const none = await sales.agent.get('/api/estimates?q=' + encodeURIComponent('100%_\\ nothing')).expect(200);
    expect(none.body).toMatchObject({ rows: [], total: 0 });
  });

  it('duplicates for a similar piece and archives', async () => {
    const dup = await post(estimator, `/api/estimates/${id}/duplicate`, {}).expect(201);
    expect(dup.body.id).not.toBe(id);
    expect(dup.body.state).toBe('draft');
    expect(dup.body.current.input.piece.dimensions.length).toBe('7 ft');
    await post(estimator, `/api/estimates/${dup.body.id}/archive`, { archived: true }).expect(200);
    const list = await sales.agent.get('/api/estimates?pageSize=100').expect(200);
    expect(list.body.rows.map((r: { id: number }) => r.id)).not.toContain(dup.body.id);
    const archived = await sales.agent.get('/api/estimates?archived=true&pageSize=100').expect(200);
    expect(archived.body.rows.map((r: { id: number }) => r.id)).toContain(dup.body.id);
  });
});

describe('repricing when nothing changed', () => {
  it('makes no new revision, leaves the estimate off the list, and names price lists by date, never by hash', async () => {
    const owner = await signInAs(app, 'owner');
    const made = await post(estimator, '/api/estimates', { customerId, pieceId, input: grand }).expect(201);
    const id = made.body.id as number;
    const day = /^(today's prices|prices of \d{1,2} [A-Z][a-z]{2} \d{4})/;
    expect(made.body.revisions[0].priceList).toMatch(day);
    expect(made.body.current.priceList).toMatch(day);

    // Priced with today's list: repricing changes nothing.
    const same = await post(owner, '/api/estimates/reprice', { ids: [id] }).expect(200);
    expect(same.body.repriced).toEqual([]);
    expect(same.body.unchanged.map((e: { id: number }) => e.id)).toEqual([id]);

    // A new price for a material this estimate does not use: the price list moves on, but prices this estimate exactly
    // as before, so it is not listed and repricing it still makes no revision.
    const used = JSON.stringify(made.body.current.result);
    const materials = await owner.agent.get('/api/price-list/materials?pageSize=100').expect(200);
    const unused = (materials.body.rows as { key: string; packs: { id: number; price: string | null }[] }[]).find((m) => !used.includes(`"${m.key}"`) && m.packs[0]?.price);
    expect(unused, 'a demo material the grand does not use').toBeDefined();
    const pack = unused!.packs[0]!;
    const moved = await post(owner, `/api/price-list/packs/${pack.id}/prices`, { price: (Number(pack.price) + 1.37).toFixed(2), effectiveFrom: workshopToday() }).expect(201);
    expect(moved.body.catalogVersion.changed).toBe(true);
    const candidates = await owner.agent.get('/api/estimates/reprice').expect(200);
    expect(candidates.body.rows.map((r: { id: number }) => r.id)).not.toContain(id);
    expect(candidates.body.priceList).toMatch(day);
    const again = await post(owner, '/api/estimates/reprice', { ids: [id] }).expect(200);
    expect(again.body.unchanged.map((e: { id: number }) => e.id)).toEqual([id]);
    const after = await estimator.agent.get(`/api/estimates/${id}`).expect(200);
    expect(after.body.revisionCount).toBe(1);
    expect(after.body.revisions[0].priceList).toMatch(/^prices of \d{1,2} [A-Z][a-z]{2} \d{4}$/);
    expect(JSON.stringify(after.body.revisions)).not.toMatch(/price list pl-/);
  });
});
