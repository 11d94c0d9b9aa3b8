/**
 * The Express app. `createApp({ db, mailer, config })` builds it without listening (tests use it with
 * supertest); server/index.ts runs it. Optional `client` serves the React app: built files from
 * dist/client with an SPA fallback, or Vite's dev middleware.
 */
import fs from 'node:fs';
import path from 'node:path';
import express, { type Express, type RequestHandler } from 'express';
import helmet from 'helmet';
import type { Config } from './config';
import type { Db } from './db/client';
import type { Mailer } from './mail/mailer';
import { createSessions } from './auth/sessions';
import { createSignInLimiter, type LimiterOptions } from './auth/rate-limit';
import { apiNotFound, errorHandler } from './http/errors';
import { inputRules, noStore, originCheck, sessionLoader } from './http/middleware';
import { createLogger, requestLogging, type Logger } from './http/logger';
import type { AppDeps } from './http/context';
import { authRoutes } from './routes/auth';
import { accountRoutes } from './routes/account';
import { teamRoutes } from './routes/teams';
import { inviteRoutes } from './routes/invites';
import { projectRoutes } from './routes/projects';
import { diagramRoutes } from './routes/diagrams';
import { uploadRoutes } from './routes/uploads';
import { libraryRoutes } from './routes/library';
import { notificationRoutes } from './routes/notifications';
import { createStorage } from './storage';
import type { UploadStorage } from './storage/types';
import { analysisPool, type AnalysisPool } from './services/analysis-pool';

export const JSON_BODY_LIMIT = '1mb';
/** Routes that carry a whole diagram document (up to 2,000 parts and 5,000 cables) take larger bodies. */
export const DIAGRAM_BODY_LIMIT = '5mb';
const DIAGRAM_BODY_ROUTES = [/^\/projects\/[^/]+\/diagrams\/?$/, /^\/diagrams\/[^/]+\/(working-copy|revisions|check)\/?$/];

/** JSON body parser: DIAGRAM_BODY_LIMIT on the diagram document routes, JSON_BODY_LIMIT everywhere else. */
function jsonBodies(): RequestHandler {
  const small = express.json({ limit: JSON_BODY_LIMIT });
  const large = express.json({ limit: DIAGRAM_BODY_LIMIT });
  return (req, res, next) => (DIAGRAM_BODY_ROUTES.some((re) => re.test(req.path)) ? large : small)(req, res, next);
}

export type ClientServing =
  | { mode: 'static'; dir: string }
  /** Vite dev server in middleware mode (server/dev.ts). */
  | { mode: 'vite'; middlewares: RequestHandler; transformIndexHtml: (url: string, html: string) => Promise<string>; indexHtmlPath: string };

export interface CreateAppOptions {
  db: Db;
  mailer: Mailer;
  config: Config;
  client?: ClientServing;
  limiter?: Partial<LimiterOptions>;
  /** Storage for uploads; by default the one the config names (DATA_DIR/uploads, or S3_BUCKET). */
  storage?: UploadStorage;
  /** Worker threads for analyses; by default the process's pool, configured from `config.analysis`. */
  analysis?: AnalysisPool;
  /** Structured log (server/http/logger.ts); by default one at `config.logLevel` on stdout. */
  logger?: Logger;
}

function securityHeaders(config: Config, dev: boolean): RequestHandler {
  const https = config.appOrigin.startsWith('https:');
  return helmet({
    contentSecurityPolicy: {
      useDefaults: false,
      directives: {
        defaultSrc: ["'self'"],
        // Dev only: Vite's React refresh preamble is an inline script, and HMR talks over a websocket.
        scriptSrc: dev ? ["'self'", "'unsafe-inline'"] : ["'self'"],
        // React Flow and Vite-injected CSS set inline styles.
        styleSrc: ["'self'", "'unsafe-inline'"],
        imgSrc: ["'self'", 'data:', 'blob:'],
        fontSrc: ["'self'", 'data:'],
        connectSrc: dev ? ["'self'", 'ws:', 'wss:'] : ["'self'"],
        workerSrc: ["'self'", 'blob:'],
        objectSrc: ["'none'"],
        baseUri: ["'self'"],
        formAction: ["'self'"],
        frameAncestors: ["'none'"],
        ...(https ? { upgradeInsecureRequests: [] } : {}),
      },
    },
    strictTransportSecurity: https ? { maxAge: 15552000, includeSubDomains: false } : false,
    crossOriginEmbedderPolicy: false,
  });
}

export function createApp(options: CreateAppOptions): Express {
  const { db, mailer, config, client } = options;
  const sessions = createSessions(db);
  const limiter = createSignInLimiter(db, options.limiter);
  const storage = options.storage ?? createStorage(config);
  const analysis = options.analysis ?? analysisPool(config.analysis);
  const deps: AppDeps = { db, mailer, config, sessions, limiter, storage, analysis };

  const app = express();
  app.disable('x-powered-by');
  // One log line per request with its id (X-Request-Id), route pattern, status and duration; no query, body or document.
  app.use(requestLogging(options.logger ?? createLogger(config.logLevel)));
  // TRUST_PROXY = n: the client's address is the one n proxies back in X-Forwarded-For (0: the socket's).
  app.set('trust proxy', config.trustProxy > 0 ? config.trustProxy : false);
  app.use(securityHeaders(config, client?.mode === 'vite'));

  const api = express.Router();
  api.use(noStore);
  api.use(originCheck(config, sessions));
  api.use(jsonBodies());
  api.use(inputRules);
  api.use(sessionLoader(config, sessions));
  api.get('/health', (_req, res) => {
    res.json({ ok: true });
  });
  api.use('/auth', authRoutes(deps));
  api.use('/account', accountRoutes(deps));
  api.use('/teams', teamRoutes(deps));
  api.use('/invites', inviteRoutes(deps));
  api.use('/projects', projectRoutes(deps));
  api.use('/diagrams', diagramRoutes(deps));
  api.use(uploadRoutes(deps));
  api.use(libraryRoutes(deps));
  api.use(notificationRoutes(deps));
  api.use(apiNotFound);
  api.use(errorHandler);
  app.use('/api', api);

  if (client?.mode === 'static') {
    const indexHtml = path.join(client.dir, 'index.html');
    // Vite's hashed build output never changes under one name; everything else is revalidated.
    app.use('/assets', express.static(path.join(client.dir, 'assets'), { immutable: true, maxAge: '365d', fallthrough: false }));
    app.use(express.static(client.dir, { index: false }));
    app.get('/{*splat}', (_req, res) => {
      res.set('Cache-Control', 'no-cache');
      res.sendFile(indexHtml);
    });
  } else if (client?.mode === 'vite') {
    app.use(client.middlewares);
    app.get('/{*splat}', async (req, res, next) => {
      try {
        const html = await client.transformIndexHtml(req.originalUrl, fs.readFileSync(client.indexHtmlPath, 'utf8'));
        res.type('html').send(html);
      } catch (err) {
        next(err);
      }
    });
  }
  app.use(errorHandler);
  return app;
}
