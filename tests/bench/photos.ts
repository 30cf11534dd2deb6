/**
 * `npm run bench:photos`: can one burst of heavy photo work stall the server? The built app on loopback (the bench
 * database), a sent quote whose piece has a camera-sized photo; then, all at once, 6 uploads of 12 photos of 12 MP
 * each (the most one request may hold) and 20 requests for the customer's quote PDF, while the health check is
 * called every 100 ms. Prints the health latency idle and under that load (p50, p95, max), how long the uploads and
 * PDFs took, and the pixels a request may hold. Figures only, no pass/fail; docs/operations.md records a run.
 * Options: BENCH_UPLOADS (default 6), BENCH_PHOTOS (default 12), BENCH_PDFS (default 20).
 */
import { createApp } from '../../server/app';
import { stopCluster } from '../../server/db/cluster';
import { startLocalServices } from '../../server/fakes';
import { PHOTO_SETTINGS } from '../../server/services/photos';
import { benchDatabase, listen, signInHttp } from './bench-env';

const UPLOADS = Number(process.env.BENCH_UPLOADS ?? 6);
const PHOTOS = Number(process.env.BENCH_PHOTOS ?? 12);
const PDFS = Number(process.env.BENCH_PDFS ?? 20);

const pct = (sorted: number[], p: number) => sorted[Math.min(sorted.length - 1, Math.floor((sorted.length - 1) * p))] ?? 0;
const summary = (xs: number[]) => {
  const s = [...xs].sort((a, b) => a - b);
  return `p50 ${pct(s, 0.5).toFixed(0)} ms, p95 ${pct(s, 0.95).toFixed(0)} ms, max ${(s.at(-1) ?? 0).toFixed(0)} ms (${s.length} calls)`;
};

/** Calls the health check every 100 ms until stopped; returns the latencies. */
function pollHealth(base: string): { stop: () => Promise<number[]> } {
  const times: number[] = [];
  let running = true;
  const loop = (async () => {
    while (running) {
      const t = performance.now();
      const res = await fetch(`${base}/api/health`);
      await res.arrayBuffer();
      times.push(performance.now() - t);
      await new Promise((r) => setTimeout(r, 100));
    }
  })();
  return {
    stop: async () => {
      running = false;
      await loop;
      return times;
    },
  };
}

async function main(): Promise<void> {
  const sharp = (await import('sharp')).default;
  const db = await benchDatabase({ estimates: 0 });
  const services = await startLocalServices(db.config);
  const built = createApp({ config: db.config, sequelize: db.sequelize, databaseUrl: db.appUrl, serveClient: false });
  const server = await listen(built.app);
  const base = server.url;
  try {
    const owner = await signInHttp(base, 'owner@example.com');
    const call = async (method: string, url: string, body?: unknown) => {
      const res = await fetch(`${base}${url}`, {
        method,
        headers: { 'content-type': 'application/json', 'x-csrf-token': owner.csrf, cookie: owner.cookie },
        body: body === undefined ? undefined : JSON.stringify(body),
      });
      if (!res.ok) throw new Error(`${method} ${url}: ${res.status} ${await res.text()}`);
      return res.json() as Promise<Record<string, unknown>>;
    };

    // A 12 MP photo as a phone makes it: textured, so that it compresses as a real one does (a few MB).
    const photo = await sharp({ create: { width: 4000, height: 3000, channels: 3, background: '#7a5a40', noise: { type: 'gaussian', mean: 120, sigma: 24 } } })
      .jpeg({ quality: 80 })
      .toBuffer();
    console.log(`[bench] test photo: 4000 × 3000 px, ${(photo.length / 1024 / 1024).toFixed(1)} MB`);

    const customer = await call('POST', '/api/customers', { name: `Photo bench ${Date.now()}`, email: 'photo.bench@example.com' });
    const piece = await call('POST', '/api/pieces', { customerId: customer.id, kind: 'grand', description: 'Photo bench grand' });
    const upload = async (count: number) => {
      const form = new FormData();
      for (let i = 0; i < count; i++) form.append('photos', new Blob([new Uint8Array(photo)], { type: 'image/jpeg' }), `photo-${i}.jpg`);
      const t = performance.now();
      const res = await fetch(`${base}/api/pieces/${piece.id}/photos`, { method: 'POST', headers: { 'x-csrf-token': owner.csrf, cookie: owner.cookie }, body: form });
      await res.arrayBuffer();
      if (res.status !== 201) throw new Error(`upload: ${res.status}`);
      return performance.now() - t;
    };
    await upload(1);
    const input = { piece: { template: 'grand', dimensions: { length: '6 ft 3 in' }, species: 'rosewood', veneered: true }, system: 'full-repolish' };
    const estimate = await call('POST', '/api/estimates', { customerId: customer.id, pieceId: piece.id, input });
    await call('POST', `/api/estimates/${estimate.id}/state`, { state: 'priced' });
    const quote = await call('POST', `/api/estimates/${estimate.id}/quotes`, {});
    const sent = await call('POST', `/api/quotes/${quote.id}/send`, {});
    const token = String(sent.link).split('/q/')[1];
    const pdf = async () => {
      const t = performance.now();
      const res = await fetch(`${base}/api/public/quotes/${token}/pdf`);
      await res.arrayBuffer();
      if (res.status !== 200) throw new Error(`pdf: ${res.status}`);
      return performance.now() - t;
    };
    const firstPdf = await pdf();
    console.log(`[bench] one quote PDF alone (with the photo's working copy): ${firstPdf.toFixed(0)} ms`);

    const idle = pollHealth(base);
    await new Promise((r) => setTimeout(r, 3000));
    const idleTimes = await idle.stop();

    const busy = pollHealth(base);
    const t0 = performance.now();
    const [uploadTimes, pdfTimes] = await Promise.all([
      Promise.all(Array.from({ length: UPLOADS }, () => upload(PHOTOS))),
      Promise.all(Array.from({ length: PDFS }, () => pdf())),
    ]);
    const wall = performance.now() - t0;
    const busyTimes = await busy.stop();

    console.log(`\nphoto limits: ${PHOTO_SETTINGS.maxPixels / 1e6} MP per photo, ${PHOTO_SETTINGS.requestPixels / 1e6} MP per request, working copy ${PHOTO_SETTINGS.workingPx} px`);
    console.log(`load: ${UPLOADS} uploads × ${PHOTOS} photos of 12 MP and ${PDFS} public quote PDFs at once, done in ${(wall / 1000).toFixed(1)} s`);
    console.log(`health idle:       ${summary(idleTimes)}`);
    console.log(`health under load: ${summary(busyTimes)}`);
    console.log(`uploads:           ${summary(uploadTimes)}`);
    console.log(`quote PDFs:        ${summary(pdfTimes)}`);
  } finally {
    await server.close();
    await built.close();
    await services.stop();
    await db.sequelize.close();
    stopCluster(db.cluster);
  }
}

main().catch((err) => {
  console.error(err);
  process.exit(1);
});
