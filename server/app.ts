import express, { type RequestHandler, type Router } from 'express';
import session from 'express-session';
import connectPgSimple from 'connect-pg-simple';
import helmet from 'helmet';
import { rateLimit } from 'express-rate-limit';
import path from 'node:path';
import fs from 'node:fs';
import type pg from 'pg';
import type { Db } from './db/client';
import type { Logger } from './lib/logger';
import type { DemoAccount } from '../shared/contracts/auth';
import type { HashParams } from './features/auth/passwords';
import { DEFAULT_HASH_PARAMS } from './features/auth/passwords';
import { HttpError } from './lib/http-error';
import { requestContext } from './middleware/request-context';
import { errorHandler, apiNotFound } from './middleware/error-handler';
import { csrfProtection } from './middleware/csrf';
import { loadActor, IDLE_TIMEOUT_MS, type ActorResolver } from './middleware/actor';
import { healthRouter } from './features/health/health.routes';
import { authRouter } from './features/auth/auth.routes';
import { accountRouter } from './features/auth/account.routes';
import { teamRouter } from './features/team/team.routes';
import { devicesRouter } from './features/devices/devices.routes';
import { holdingRouter, kitchenBoardRouter, writtenProceduresRouter } from './features/holding/holding.routes';
import { deviceActorResolver } from './features/devices/devices.service';
import { batchesRouter } from './features/batches/batches.routes';
import { allergenMatrixRouter, recipesRouter } from './features/recipes/recipes.routes';
import { ruleProfilesRouter } from './features/rule-profiles/rule-profiles.routes';
import { businessRouter } from './features/business/business.routes';
import { ingredientsRouter, supplierLotsRouter } from './features/ingredients/ingredients.routes';
import { localDiskStorage, type FileStorage } from './lib/storage';
import { sentMailRouter } from './features/mail/mail.routes';
import { recallsRouter, traceRouter } from './features/trace/trace.routes';
import { cleaningRunsRouter, cleaningTemplatesRouter, equipmentRouter, sanitiserProductsRouter } from './features/cleaning/cleaning.routes';
import { customersRouter, salesRouter } from './features/sales/sales.routes';
import { labelsRouter } from './features/labels/labels.routes';
import { lotPageRouter } from './features/labels/lot-page.routes';
import { calendarFeedPublicRoute, calendarFeedsRouter, documentsRouter } from './features/documents/documents.routes';
import { inspectorExchangeRoute, inspectorLinksRouter, inspectorRouter, noReferrer } from './features/inspector/inspector.routes';
import { inspectorActorResolver } from './features/inspector/inspector-links.service';
import { auditPacketsRouter } from './features/records/audit-packet.routes';
import { allow } from './middleware/access';

export interface AppConfig {
  publicBaseUrl: string;
  sessionSecret: string;
  demoMode: boolean;
  signupEnabled: boolean;
  trustProxy: boolean;
  /** Secure + __Host- cookie when served over https (or behind a trusted https proxy). */
  secureCookies: boolean;
  cookieName: string;
  dataDir: string;
  uploadDir: string;
  /** Built client to serve; omitted in API-only tests. */
  staticDir?: string;
  demoAccounts: DemoAccount[];
  hashParams: HashParams;
  /** Failed sign-ins allowed per account / per address in each window (A4-2.2.1: at most 100 an hour per account). */
  signInLimitPerAccount: number;
  signInLimitPerAddress: number;
  /** Length of the sign-in throttling window; 15 minutes unless a test shortens it. */
  signInWindowMs: number;
  /** True when mail goes to the local SMTP stand-in (no SMTP_URL): the Sent mail page shows it. */
  mailCapturing?: boolean;
  /** Public lot-page requests allowed per address per minute (default 300). */
  lotPageLimitPerMinute?: number;
}

export interface AppDeps {
  db: Db;
  pool: pg.Pool;
  config: AppConfig;
  logger: Logger;
  /** The clock, injectable so tests can move time (session expiry, timers, reminders). */
  now: () => Date;
  limits: Record<'signInByAccount' | 'signInByAddress' | 'signUp', RequestHandler>;
  actorResolvers: Partial<Record<'device' | 'inspector', ActorResolver>>;
  /** Uploaded files (supplier labels, documents): local disk under config.uploadDir unless replaced. */
  storage: FileStorage;
}

export type CreateAppInput = Omit<AppDeps, 'limits' | 'actorResolvers' | 'storage'> & { actorResolvers?: AppDeps['actorResolvers']; storage?: FileStorage };

export function defaultConfig(overrides: Partial<AppConfig> & Pick<AppConfig, 'publicBaseUrl' | 'sessionSecret'>): AppConfig {
  const secure = overrides.secureCookies ?? overrides.publicBaseUrl.startsWith('https://');
  const dataDir = overrides.dataDir ?? '.data';
  return {
    demoMode: false,
    signupEnabled: true,
    trustProxy: false,
    secureCookies: secure,
    cookieName: secure ? '__Host-crumbtrail' : 'crumbtrail',
    dataDir,
    uploadDir: path.join(dataDir, 'uploads'),
    demoAccounts: [],
    hashParams: DEFAULT_HASH_PARAMS,
    signInLimitPerAccount: 20,
    signInLimitPerAddress: 100,
    signInWindowMs: 15 * 60 * 1000,
    ...overrides,
  };
}

const tooMany = (message: string): RequestHandler => (_req, res, next) => {
  next(new HttpError(429, 'rate_limited', message, undefined, { 'Retry-After': String(res.getHeader('Retry-After') ?? 60) }));
};

export function createApp(input: CreateAppInput) {
  const { config, logger, pool } = input;
  const windowMs = config.signInWindowMs;
  const deps: AppDeps = {
    ...input,
    // Kitchen devices are always resolvable; tests or features may add others (inspector links).
    actorResolvers: { ...input.actorResolvers, device: deviceActorResolver, inspector: inspectorActorResolver },
    storage: input.storage ?? localDiskStorage(config.uploadDir),
    limits: {
      // Counts failures only, per account: a real user is never locked out for more than the window.
      signInByAccount: rateLimit({
        windowMs, limit: config.signInLimitPerAccount, skipSuccessfulRequests: true, standardHeaders: 'draft-8', legacyHeaders: false,
        keyGenerator: (req) => `acct:${String(req.body?.email ?? '').trim().toLowerCase()}`,
        handler: tooMany('Too many failed sign-ins for this account. Wait a few minutes and try again.'),
      }),
      signInByAddress: rateLimit({
        windowMs, limit: config.signInLimitPerAddress, skipSuccessfulRequests: true, standardHeaders: 'draft-8', legacyHeaders: false,
        handler: tooMany('Too many failed sign-ins from this address. Wait a few minutes and try again.'),
      }),
      signUp: rateLimit({ windowMs, limit: 20, standardHeaders: 'draft-8', legacyHeaders: false, handler: tooMany('Too many sign-ups from this address. Try again later.') }),
    },
  };

  const app = express();
  app.disable('x-powered-by');
  if (config.trustProxy) app.set('trust proxy', 1);
  app.use((req, _res, next) => (req.method === 'TRACE' || req.method === 'TRACK' ? next(new HttpError(405, 'forbidden', 'Method not allowed.')) : next()));
  // Before request logging, helmet and sessions: the lot page sets its own headers and is the hot public path.
  app.use(lotPageRouter(deps));
  app.use(requestContext(logger));
  const isHttps = config.publicBaseUrl.startsWith('https://');
  app.use(
    helmet({
      contentSecurityPolicy: {
        useDefaults: true,
        directives: {
          'default-src': ["'self'"],
          'base-uri': ["'none'"],
          'object-src': ["'none'"],
          'frame-ancestors': ["'none'"],
          'img-src': ["'self'", 'data:', 'blob:'],
          // The label preview shows the generated PDF from a blob: URL in a frame.
          'frame-src': ["'self'", 'blob:'],
          'form-action': ["'self'"],
          // Plain-http loopback (demo, tests) would break if every request were upgraded to https.
          'upgrade-insecure-requests': isHttps ? [] : null,
        },
      },
      strictTransportSecurity: { maxAge: 31_536_000, includeSubDomains: true },
      referrerPolicy: { policy: 'same-origin' },
    }),
  );

  const PgStore = connectPgSimple(session);
  const api = express.Router();
  api.use((_req, res, next) => {
    res.set('Cache-Control', 'no-store');
    next();
  });
  api.use(express.json({ limit: '1mb' }));
  // Also used by the inspector link exchange outside /api, which starts a session.
  const sessionMiddleware = session({
    name: config.cookieName,
    secret: config.sessionSecret,
    // No touch (an UPDATE on every request): the row is saved when loadActor moves lastSeenAt, at most once a minute.
    store: new PgStore({ pool, tableName: 'user_sessions', createTableIfMissing: false, pruneSessionInterval: 15 * 60, disableTouch: true }),
    resave: false,
    saveUninitialized: false,
    rolling: true,
    proxy: config.trustProxy,
    cookie: { httpOnly: true, sameSite: 'lax', secure: config.secureCookies, path: '/', maxAge: IDLE_TIMEOUT_MS },
  });
  api.use(sessionMiddleware);
  api.use(csrfProtection([new URL(config.publicBaseUrl).origin]));
  api.use(loadActor(input.db, input.now, deps.actorResolvers));
  mountApiRoutes(api, deps);
  api.use(apiNotFound);
  app.use('/api', api);

  mountPublicRoutes(app, deps, sessionMiddleware);

  if (config.staticDir && fs.existsSync(config.staticDir)) {
    const staticDir = path.resolve(config.staticDir);
    app.use(express.static(staticDir, { index: false, maxAge: '1h', setHeaders: (res, file) => { if (file.includes(`${path.sep}assets${path.sep}`)) res.set('Cache-Control', 'public, max-age=31536000, immutable'); } }));
    const indexHtml = path.join(staticDir, 'index.html');
    app.get('/{*splat}', (_req, res) => {
      res.set('Cache-Control', 'no-cache');
      res.sendFile(indexHtml);
    });
  }
  app.use(errorHandler(logger));
  return app;
}

/** Feature API routers, each under /api/<plural-noun>. */
function mountApiRoutes(api: Router, deps: AppDeps) {
  api.use('/health', healthRouter(deps));
  api.use('/auth', authRouter(deps));
  api.use('/account', accountRouter(deps));
  api.use('/team', teamRouter(deps));
  api.use('/devices', devicesRouter(deps));
  api.use('/sent-mail', sentMailRouter(deps));
  api.use('/documents', documentsRouter(deps));
  api.use('/calendar-feeds', calendarFeedsRouter(deps));
  api.use('/inspector-links', inspectorLinksRouter(deps));
  api.use('/inspector', inspectorRouter(deps));
  api.use('/audit-packets', auditPacketsRouter(deps));
  api.use('/holding-periods', holdingRouter(deps));
  api.use('/written-procedures', writtenProceduresRouter(deps));
  api.use('/kitchen-board', kitchenBoardRouter(deps));
  api.use('/equipment', equipmentRouter(deps));
  api.use('/sanitiser-products', sanitiserProductsRouter(deps));
  api.use('/cleaning-templates', cleaningTemplatesRouter(deps));
  api.use('/cleaning-runs', cleaningRunsRouter(deps));
  api.use('/batches', batchesRouter(deps));
  api.use('/labels', labelsRouter(deps));
  api.use('/recipes', recipesRouter(deps));
  api.use('/allergen-matrix', allergenMatrixRouter(deps));
  api.use('/rule-profiles', ruleProfilesRouter(deps));
  api.use('/business', businessRouter(deps));
  api.use('/ingredients', ingredientsRouter(deps));
  api.use('/supplier-lots', supplierLotsRouter(deps));
  api.use('/sales', salesRouter(deps));
  api.use('/customers', customersRouter(deps));
  api.use('/trace', traceRouter(deps));
  api.use('/recalls', recallsRouter(deps));
}

/** Pages served outside /api: the inspector link exchange, calendar feeds (the lot page is mounted first). */
function mountPublicRoutes(app: express.Express, deps: AppDeps, sessionMiddleware: RequestHandler) {
  app.get('/inspect/:token', allow('public'), sessionMiddleware, inspectorExchangeRoute(deps));
  app.use('/inspector', noReferrer);
  app.get('/calendar/:file', allow('public'), calendarFeedPublicRoute(deps));
}
