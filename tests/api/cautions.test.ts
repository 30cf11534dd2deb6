/**
 * One voice for safety, two audiences: the staff's estimate carries the ventilation working (each solvent against
 * its own limit, the exposure index, the mixing factor); the customer's quote page (JSON) and quote PDF carry the
 * plain cautions (fire, vapour, oily rags, local codes, the regulator, licensed practice) and none of the
 * workshop's air-change arithmetic.
 */
import { execFileSync } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { closeTestApp, getTestApp, signInAs, startServices, type Session } from '../helpers/app';

const { app } = getTestApp();
let services: Awaited<ReturnType<typeof startServices>>;
let estimator: Session;
let sales: Session;
let estimateId: number;
let token: string;

afterAll(async () => {
  await services?.stop();
  await closeTestApp();
});

const post = (s: Session, url: string, body: object) => s.agent.post(url).set('x-csrf-token', s.csrf).send(body);
// A full repolish strips first: the stripper's own vapour gives the "other solvents" caution too.
const grand = { piece: { template: 'grand', dimensions: { length: '6 ft 3 in' }, species: 'rosewood', veneered: true }, system: 'full-repolish' };

function pdfText(pdf: Buffer): string {
  const file = path.join(os.tmpdir(), `cautions-${process.pid}-${Date.now()}.pdf`);
  fs.writeFileSync(file, pdf);
  try {
    return execFileSync('pdftotext', ['-layout', file, '-'], { encoding: 'utf8' }).replace(/\s+/g, ' ');
  } finally {
    fs.rmSync(file, { force: true });
  }
}

/** The workshop's air-change arithmetic, in any of the ways it is written: none of it is for the customer. */
const WORKING = [
  /m³\s*\/\s*h/i,
  /m3\s*\/\s*h/i,
  /ft³\s*\/\s*min/i,
  /ft3\s*\/\s*min/i,
  /\bcfm\b/i,
  /\bppm\b/i,
  /exposure\s*index/i,
  /exposureIndex/,
  /mixing\s*factor/i,
  /mixingFactor/,
  /air\s*changes?\s*(per|an|a)\s*hour/i,
  /\bLEL\b/,
  /evaporat\w*\s*rate/i,
];

/** The plain cautions every customer-facing output carries. */
const PLAIN = [
  /flammable/i, // fire
  /vapour/i, // vapour
  /rags/i, // oily rags
  /catch fire on their own|self-ignit/i, // what the rags do
  /local fire codes/i,
  /workplace-safety regulator/i,
  /licensed practice/i,
];

/** Every key and every string in a JSON value, the link's token left out. */
function walk(value: unknown, keys: string[] = [], strings: string[] = []): { keys: string[]; strings: string[] } {
  if (typeof value === 'string') {
    if (!value.includes(token)) strings.push(value);
  } else if (Array.isArray(value)) {
    for (const v of value) walk(v, keys, strings);
  } else if (value && typeof value === 'object') {
    for (const [k, v] of Object.entries(value)) {
      keys.push(k);
      walk(v, keys, strings);
    }
  }
  return { keys, strings };
}

beforeAll(async () => {
  services = await startServices();
  estimator = await signInAs(app, 'estimator');
  sales = await signInAs(app, 'sales');
  const c = await post(sales, '/api/customers', { name: 'Clementine Aldervane', email: `cautions.${process.pid}@example.com` }).expect(201);
  const p = await post(estimator, '/api/pieces', { customerId: c.body.id, kind: 'grand', description: 'Rosewood grand' }).expect(201);
  const e = await post(estimator, '/api/estimates', { customerId: c.body.id, pieceId: p.body.id, input: grand }).expect(201);
  estimateId = e.body.id;
  await post(estimator, `/api/estimates/${estimateId}/state`, { state: 'priced' }).expect(200);
  const q = await post(sales, `/api/estimates/${estimateId}/quotes`, {}).expect(201);
  const sent = await post(sales, `/api/quotes/${q.body.id}/send`, {}).expect(200);
  token = String(sent.body.link).split('/q/')[1]!;
});

describe('the staff estimate carries the ventilation working', () => {
  it('each solvent against its own limit, the exposure index and the mixing factor', async () => {
    const est = await estimator.agent.get(`/api/estimates/${estimateId}`).expect(200);
    const vent = est.body.current.result.ventilation;
    expect(vent.components.length).toBeGreaterThan(0);
    for (const c of vent.components) {
      expect(c.limitPpm).toBeGreaterThan(0);
      expect(c.requiredFlowM3h).toBeGreaterThan(0);
      expect(c.evaporationLPerMin).toBeGreaterThan(0);
    }
    // The spirit's shares add up to the whole spirit.
    expect(vent.components.reduce((t: number, c: { share: number }) => t + c.share, 0)).toBeCloseTo(1, 9);
    expect(vent.exposureIndex).toBeGreaterThan(0);
    expect(vent.mixingFactor).toBeGreaterThanOrEqual(1);
    expect(vent.requiredFlowM3h).toBeGreaterThan(0);
    // The staff's cautions carry the same plain safety words as the customer's.
    const text = est.body.current.result.cautions.map((c: { text: string }) => c.text).join(' ');
    for (const re of PLAIN) expect(text).toMatch(re);
  });
});

describe('the customer reads plain cautions, without the working', () => {
  it('the quote page (JSON): fire, vapour, oily rags and local rules; no air-change arithmetic anywhere in it', async () => {
    const res = await request(app).get(`/api/public/quotes/${token}`).expect(200);
    const cautionText = res.body.cautions.map((c: { text: string }) => c.text).join(' ');
    for (const re of PLAIN) expect(cautionText).toMatch(re);
    const { keys, strings } = walk(res.body);
    for (const k of ['ventilation', 'components', 'exposureIndex', 'mixingFactor', 'requiredFlowM3h', 'limitPpm', 'concentrationPpm']) {
      expect(keys).not.toContain(k);
    }
    const all = strings.join('\n');
    for (const re of WORKING) expect(all).not.toMatch(re);
  });

  it('the quote PDF: the same plain cautions; no air-change arithmetic', async () => {
    const pdf = await request(app)
      .get(`/api/public/quotes/${token}/pdf`)
      .buffer(true)
      .parse((res, cb) => {
        const chunks: Buffer[] = [];
        res.on('data', (c: Buffer) => chunks.push(c));
        res.on('end', () => cb(null, Buffer.concat(chunks)));
      })
      .expect(200);
    expect(pdf.headers['content-type']).toBe('application/pdf');
    const text = pdfText(pdf.body as Buffer);
    for (const re of PLAIN) expect(text).toMatch(re);
    for (const re of WORKING) expect(text).not.toMatch(re);
  });

  it('the patterns would catch the working: the staff figures written out trip them', async () => {
    // Guards the guard: the staff's own ventilation figures, written as a person would, are caught.
    const est = await estimator.agent.get(`/api/estimates/${estimateId}`).expect(200);
    const v = est.body.current.result.ventilation;
    const written = [
      `${Math.round(v.requiredFlowM3h)} m³/h`,
      `${Math.round(v.requiredFlowCfm)} ft³/min`,
      `${Math.round(v.components[0].limitPpm)} ppm`,
      `exposure index ${v.exposureIndex.toFixed(2)}`,
      `mixing factor ${v.mixingFactor}`,
    ];
    for (const w of written) expect(WORKING.some((re) => re.test(w))).toBe(true);
  });
});
