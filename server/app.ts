import fs from 'node:fs';
import { startExpirySweep } from './services/quote-expiry';
import path from 'node:path';
import express, { type Express, type RequestHandler } from 'express';
import session from 'express-session';
import helmet from 'helmet';
import pg from 'pg';
import type { Sequelize } from 'sequelize';
import '@shared/schemas/error-map';
import { rootDir, type Config } from './config';
import { configurePassport } from './auth/passport';
import { ThrottledPgStore } from './auth/session-store';
import { csrf } from './http/csrf';
import type { RouteInfo } from './http/guard';
import { encodingPolicy, pathPolicy, queryPolicy, textPolicy } from './http/input';
import { apiNotFound, errorHandler } from './http/problem';
import { initModels } from './models';
import { installWorkshopSetting } from './db/workshop-context';
import { accountRoutes } from './routes/accounts';
import { messageRoutes } from './routes/messages';
import { createMessageQueue, tellCustomerOfJobEvents, type MessageQueue } from './services/messages';
import { auditRoutes } from './routes/audit';
import { authRoutes } from './routes/auth';
import { calcRoutes } from './routes/calc';
import { customerRoutes } from './routes/customers';
import { estimateRoutes } from './routes/estimates';
import { finishingRoutes } from './routes/finishing';
import { healthRoutes } from './routes/health';
import { invitationRoutes } from './routes/invitations';
import { pieceRoutes } from './routes/pieces';
import { planningRoutes } from './routes/planning';
import { jobEndRoutes } from './routes/job-end';
import { publicQuoteRoutes } from './routes/public-quotes';
import { quoteRoutes } from './routes/quotes';
import { priceListRoutes } from './routes/price-list';
import { cardPaymentRoutes } from './routes/card-payments';
import { settingsRoutes } from './routes/settings';
import { reportRoutes } from './routes/reports';
import { stockRoutes } from './routes/stock';
import { userRoutes } from './routes/users';
import { workshopRoutes } from './routes/workshop';
import { signupRoutes } from './routes/signup';
import { checklistRoutes } from './routes/checklist';
import { invalidateAfterWrites, SharedCaches } from './services/shared-caches';

export interface AppDeps {
  config: Config;
  sequelize: Sequelize;
  /** The same database as `sequelize`, for the session store's own small pool. */
  databaseUrl: string;
  /** Serve the built client from dist/ (off in API tests). */
  serveClient?: boolean;
  /** Start the message queue (pg-boss) with the app (on unless a caller runs its own). */
  queue?: boolean;
}

export interface BuiltApp {
  app: Express;
  /** Every API route with the roles it allows; the role-matrix test walks it. */
  routes: RouteInfo[];
  /** This app's in-memory users and catalog, dropped on every instance through LISTEN/NOTIFY. */
  caches: SharedCaches;
  /** The durable message queue (pg-boss), started with the app and stopped by close(); `ready` once it runs. */
  queue: MessageQueue | undefined;
  close(): Promise<void>;
}

/** Paths under /api that are not cookie-authenticated and so need no CSRF token (signed links, webhooks). */
const CSRF_EXEMPT = [/^\/api\/public\//, /^\/api\/webhooks\//];

/** Builds the Express app without listening. */
export function createApp({ config, sequelize, databaseUrl, serveClient = true, queue: withQueue = true }: AppDeps): BuiltApp {
  initModels(sequelize);
  // Every connection the app takes carries the workshop of the work that takes it (row-level security).
  installWorkshopSetting(sequelize);
  const routes: RouteInfo[] = [];
  const app = express();
  app.disable('x-powered-by');
  app.set('trust proxy', config.trustProxy ? 1 : false);
  app.set('query parser', 'simple');

  app.use(
    helmet({
      contentSecurityPolicy: {
        useDefaults: false,
        directives: {
          defaultSrc: ["'self'"],
          baseUri: ["'self'"],
          connectSrc: ["'self'"],
          fontSrc: ["'self'", 'data:'],
          formAction: ["'self'"],
          frameAncestors: ["'none'"],
          imgSrc: ["'self'", 'data:', 'blob:'],
          objectSrc: ["'none'"],
          scriptSrc: ["'self'"],
          styleSrc: ["'self'", "'unsafe-inline'"],
        },
      },
    }),
  );
  // One input policy before any route: a well-formed path, a content coding the parser can undo, and no NUL or
  // unpaired surrogate in any string of the path, query or body (server/http/input.ts).
  app.use(pathPolicy, encodingPolicy, queryPolicy);
  // Webhooks are verified against their raw bytes: they skip the JSON parser.
  const json = express.json({ limit: '1mb' });
  app.use((req, res, next) => (req.path.startsWith('/api/webhooks/') ? next() : json(req, res, next)));
  app.use(textPolicy);

  // Health answers before the session store is touched, so it works while the database is down.
  app.use(healthRoutes(sequelize, routes));

  const sessionPool = new pg.Pool({ connectionString: databaseUrl, max: 4, connectionTimeoutMillis: 3_000 });
  sessionPool.on('error', () => {
    /* a dropped idle connection: the next query opens a new one */
  });
  const caches = new SharedCaches(databaseUrl);
  app.locals.caches = caches;
  app.use(
    session({
      name: 'sw.sid',
      // The session's expiry in the database moves at most every 5 minutes, not on every request,
      // and a read is answered from this instance's memory until the database says the session changed.
      store: new ThrottledPgStore({ pool: sessionPool, touchAfterMs: 5 * 60 * 1000, pruneSessionInterval: 15 * 60, caches }),
      secret: config.sessionSecret,
      resave: false,
      saveUninitialized: false,
      rolling: true,
      proxy: config.trustProxy,
      cookie: { httpOnly: true, sameSite: 'lax', secure: 'auto', maxAge: 12 * 60 * 60 * 1000 },
    }),
  );
  const passport = configurePassport();
  app.use(passport.initialize());
  app.use(passport.session());

  // CSRF guards what a session cookie authorises: writes by a signed-in user, and sign-in itself. A signed-out
  // write carries no authority and meets the route guard's 401 instead.
  const csrfCheck: RequestHandler = (req, res, next) => {
    if (CSRF_EXEMPT.some((re) => re.test(req.originalUrl))) return next();
    if (!req.user && req.originalUrl !== '/api/auth/login') return next();
    csrf.csrfSynchronisedProtection(req, res, next);
  };
  app.use('/api', csrfCheck);
  // This instance's own writes to users and the price list drop its caches before it answers; other instances
  // hear of them through the database's notification.
  app.use(invalidateAfterWrites(caches));

  app.use(authRoutes(config, sequelize, routes, sessionPool));
  app.use(userRoutes(sequelize, routes));
  app.use(signupRoutes(config, sequelize, routes, sessionPool));
  app.use(checklistRoutes(sequelize, routes));
  app.use(...invitationRoutes(config, sequelize, routes));
  app.use(workshopRoutes(routes));
  app.use(calcRoutes(sequelize, routes));
  app.use(customerRoutes(sequelize, routes));
  app.use(pieceRoutes(config, sequelize, routes));
  app.use(estimateRoutes(sequelize, routes));
  app.use(quoteRoutes(config, sequelize, routes));
  app.use(publicQuoteRoutes(config, sequelize, routes));
  app.use(priceListRoutes(sequelize, routes));
  app.use(settingsRoutes(sequelize, routes));
  app.use(cardPaymentRoutes(config, sequelize, routes));
  app.use(finishingRoutes(sequelize, routes));
  app.use(auditRoutes(sequelize, routes));
  app.use(...planningRoutes(sequelize, routes));
  app.use(...stockRoutes(config, sequelize, routes));
  app.use(...reportRoutes(routes));
  app.use(...accountRoutes(config, sequelize, routes));
  app.use(messageRoutes(config, sequelize, routes));
  app.use(...jobEndRoutes(config, sequelize, routes));
  app.use('/api', apiNotFound);

  if (serveClient) {
    const dist = path.join(rootDir, 'dist');
    if (fs.existsSync(path.join(dist, 'index.html'))) {
      app.use(express.static(dist, { index: false, maxAge: '1h' }));
      app.get('/{*splat}', (_req, res) => {
        res.setHeader('Cache-Control', 'no-cache');
        res.sendFile(path.join(dist, 'index.html'));
      });
    }
  }
  app.use(errorHandler);

  // Quotes past their date are written as expired on a schedule (reads compute it): never by a GET.
  const stopExpirySweep = startExpirySweep(sequelize);
  // Customer messages are sent and scheduled through the durable queue in PostgreSQL (pg-boss, schema pgboss).
  const queue = withQueue ? createMessageQueue({ config, sequelize, databaseUrl }) : undefined;
  queue?.start().catch((err: unknown) => console.error(`[queue] could not start: ${err instanceof Error ? err.message : String(err)}`));
  // The piece marked ready tells the customer, once.
  const unhookJobMessages = withQueue ? tellCustomerOfJobEvents(sequelize, config) : undefined;

  return {
    app,
    routes,
    caches,
    queue,
    close: async () => {
      unhookJobMessages?.();
      await queue?.stop();
      await stopExpirySweep();
      await caches.close();
      await sessionPool.end();
    },
  };
}
