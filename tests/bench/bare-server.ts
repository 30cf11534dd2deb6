/**
 * The bench's yardstick: a bare Express answering `GET /bare` with a small JSON body, run the way `npm run serve`
 * runs the app (node:cluster, WEB_CONCURRENCY workers on PORT), so the two are compared process for process.
 */
import cluster from 'node:cluster';
import express from 'express';
import { workerCount } from '../../server/cluster';

const port = Number(process.env.PORT ?? 3000);
if (cluster.isPrimary) {
  for (let i = 0; i < workerCount(); i++) cluster.fork();
  process.once('SIGTERM', () => {
    for (const w of Object.values(cluster.workers ?? {})) w?.process.kill('SIGTERM');
    process.exit(0);
  });
} else {
  const app = express();
  app.get('/bare', (_req, res) => {
    res.json({ status: 'ok' });
  });
  app.listen(port, '127.0.0.1', () => console.log(`[bare] up, pid ${process.pid}`));
  process.once('SIGTERM', () => process.exit(0));
}
