import { existsSync } from 'node:fs';
import { EventEmitter } from 'node:events';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import express, { type Express, type Request, type RequestHandler } from 'express';
import helmet from 'helmet';
import morgan from 'morgan';
import type { Env } from './env.ts';
import type { Database } from './db/client.ts';
import { errorMiddleware, notFoundApi } from './http/errors.ts';
import { healthRouter } from './api/health/router.ts';
import { authRouter } from './api/auth/router.ts';
import { sketchesRouter, teamSketchesRouter } from './api/sketches/router.ts';
import { teamsRouter } from './api/teams/router.ts';
import { reviewRouter } from './api/review/router.ts';
import { solveRouter } from './api/solve/router.ts';
import { mailboxRouter } from './api/mailbox/router.ts';
import { studiesRouter } from './api/studies/router.ts';
import { reportsRouter } from './api/reports/router.ts';
import { preferencesRouter } from './api/preferences/router.ts';
import { csrfGuard } from './http/csrf.ts';
import { refuseDeepJson, refuseNonJsonBodies } from './http/jsonDepth.ts';
import { createHeavyWork, DEFAULT_HEAVY_WORK } from './http/heavyWork.ts';
import { clientKey, createDeviceKeys, createLimiter } from './http/rateLimit.ts';
import { requireUser } from './auth/guards.ts';
import { createMailer, type Mailer } from './mail/mailer.ts';
import type { AppContext } from './context.ts';
import { redactingLog, urlForLog } from './log.ts';
import { createEditQueue } from './realtime/editLog.ts';
import { createSession } from './auth/session.ts';
import { createPassport } from './auth/passport.ts';

export const REPO_ROOT = fileURLToPath(new URL('..', import.meta.url));

export interface AppDeps {
  env: Env;
  database: Database;
  log?: (line: string) => void;
  /** Outgoing mail; default: nodemailer over env.SMTP_URL. */
  mailer?: Mailer;
  /** Base URL for links in e-mails when PUBLIC_URL is unset (startServer passes its address). */
  publicUrl?: () => string;
  /** Rate-limit sizes (tests make them small). */
  limits?: Partial<RateLimits>;
}

export interface RateLimits {
  /** Failed sign-ins per account and device (or, without a device cookie, address) per 15 minutes. */
  signInFailures: number;
  /** Failed sign-ins per address over all accounts per 15 minutes (devices known to an account are exempt). */
  signInFailuresPerAddress: number;
  /** Sign-ups per address per hour. */
  signUps: number;
  /** Reset requests per address per hour (confirming a valid link is never limited). */
  resets: number;
  /** Invitations per inviting user per hour. */
  invites: number;
  /** Heavy requests (server-side studies, PDF reports) one person may have running at once, over every instance [H1]. */
  heavyPerUser: number;
  /** Heavy requests this instance runs at once, over everyone [H1]. */
  heavyTotal: number;
}

export const DEFAULT_LIMITS: RateLimits = { signInFailures: 10, signInFailuresPerAddress: 100, signUps: 10, resets: 10, invites: 50, heavyPerUser: DEFAULT_HEAVY_WORK.perUser, heavyTotal: DEFAULT_HEAVY_WORK.total };

export interface BuiltApp {
  app: Express;
  /** The session middleware, reused by the socket.io handshake. */
  session: RequestHandler;
  /** passport's initialize + session, reused by the socket.io handshake. */
  passportMiddleware: RequestHandler[];
  /** Stops timers owned by the app (session pruning) and the mail transport. */
  close(): void;
  context: AppContext;
}

/**
 * Builds the Express app. Order matters and is explicit: security headers → request log → body
 * parsing → CSRF guard → session → passport → public API routers → signed-in API routers → API
 * 404 → static client with SPA fallback → the one error middleware.
 */
export function createApp({ env, database, log: rawLog = (l) => console.log(l), mailer, publicUrl, limits }: AppDeps): BuiltApp {
  // Every line the app logs passes through redaction (no credentials or personal data).
  const log = redactingLog(rawLog);
  const app = express();
  app.disable('x-powered-by');
  // X-Forwarded-* is believed only from the proxies TRUST_PROXY names; req.ip, req.host and
  // req.secure follow from it, and the socket handshake uses the same rule (http/forwarded.ts).
  app.set('trust proxy', env.TRUST_PROXY);

  app.use(
    helmet({
      contentSecurityPolicy: {
        useDefaults: true,
        directives: {
          // ant-design-vue injects its CSS-in-JS as <style> elements.
          'style-src': ["'self'", "'unsafe-inline'"],
          'img-src': ["'self'", 'data:', 'blob:'],
          'font-src': ["'self'", 'data:'],
          'worker-src': ["'self'", 'blob:'],
          'connect-src': ["'self'"],
          // Plain-HTTP deployments on a LAN must not have their requests rewritten to https.
          'upgrade-insecure-requests': null,
        },
      },
      // HSTS only means something over TLS; sent below for secure requests only.
      strictTransportSecurity: false,
    }),
  );
  app.use((req, res, next) => {
    if (req.secure) res.setHeader('Strict-Transport-Security', 'max-age=31536000; includeSubDomains');
    next();
  });

  const logRequests = env.LOG_REQUESTS ?? env.NODE_ENV !== 'test';
  if (logRequests) {
    // Links in e-mails carry tokens in their query (…/reset-password?token=…): the logged URL
    // withholds such values.
    morgan.token('safe-url', (req) => urlForLog((req as express.Request).originalUrl ?? req.url ?? ''));
    app.use(morgan(':date[iso] :method :safe-url :status :res[content-length] - :response-time ms', { stream: { write: (l) => log(l.trimEnd()) } }));
  }

  app.use(express.json({ limit: '1mb' }), refuseDeepJson);
  app.use('/api', refuseNonJsonBodies);

  const session = createSession(database.pool, env.SESSION_SECRET);
  const passport = createPassport(database.db);
  const passportMiddleware = [passport.initialize(), passport.session()];
  // API answers are about one person and must not be kept by browsers or shared caches.
  app.use('/api', (_req, res, next) => {
    res.setHeader('Cache-Control', 'private, no-store');
    next();
  });
  app.use('/api', csrfGuard, session.middleware, ...passportMiddleware);

  const sizes = { ...DEFAULT_LIMITS, ...limits };
  const ownMailer = mailer ?? createMailer(env.SMTP_URL, env.MAIL_FROM, log);
  const context: AppContext = {
    db: database.db,
    mailer: ownMailer,
    publicUrl: () => (env.PUBLIC_URL ?? publicUrl?.() ?? `http://${env.HOST}:${env.PORT}`).replace(/\/$/, ''),
    log,
    devPages: env.NODE_ENV !== 'production',
    mailboxOperators: new Set(env.NODE_ENV === 'production' ? [] : env.MAILBOX_OPERATOR),
    events: new EventEmitter(),
    edits: createEditQueue(database.db, { log }),
    heavy: createHeavyWork(database.db, { perUser: sizes.heavyPerUser, total: sizes.heavyTotal }, { log }),
    studyPauseMs: env.FAULT_STUDY_PAUSE_MS ?? 0,
    studySlicePoints: env.FAULT_STUDY_SLICE_POINTS,
  };
  const HOUR = 60 * 60 * 1000;
  const devices = createDeviceKeys(env.SESSION_SECRET);
  const signInEmail = (req: Request) => String(req.body?.email ?? '').trim().toLowerCase();
  const signInLimits = [
    createLimiter(database.db, {
      name: 'sign-in',
      windowMs: HOUR / 4,
      limit: sizes.signInFailures,
      what: 'failed sign-in attempts for this account from here',
      onlyFailures: true,
      key: (req) => {
        const email = signInEmail(req);
        const device = devices.deviceOf(req, email);
        return device ? `device:${device}|${email}` : `address:${clientKey(req)}|${email}`;
      },
    }, log),
    createLimiter(database.db, {
      name: 'sign-in-address',
      windowMs: HOUR / 4,
      limit: sizes.signInFailuresPerAddress,
      what: 'failed sign-in attempts from your address',
      onlyFailures: true,
      key: clientKey,
      skip: (req) => devices.deviceOf(req, signInEmail(req)) !== null,
    }, log),
  ];
  const signUpLimit = createLimiter(database.db, { name: 'sign-up', windowMs: HOUR, limit: sizes.signUps, what: 'sign-ups from your address', key: clientKey }, log);
  const resetLimit = createLimiter(database.db, { name: 'reset', windowMs: HOUR, limit: sizes.resets, what: 'password-reset requests from your address', key: clientKey }, log);
  const inviteLimit = createLimiter(database.db, { name: 'invite', windowMs: HOUR, limit: sizes.invites, what: 'invitations sent', key: (req) => req.user?.id ?? clientKey(req) }, log);

  // Public routes.
  app.use('/api/health', healthRouter(database.db, log));
  app.use('/api/auth', authRouter(context, passport, { signIn: signInLimits, signUp: signUpLimit, reset: resetLimit, rememberDevice: devices.remember }));
  // Everything below needs a signed-in user; each service then checks the team role.
  app.use('/api/teams/:teamId/sketches', requireUser, teamSketchesRouter(context));
  app.use('/api/teams', requireUser, teamsRouter(context, { invite: inviteLimit }));
  app.use('/api/sketches', requireUser, sketchesRouter(context));
  app.use('/api', reviewRouter(context));
  app.use('/api', studiesRouter(context));
  app.use('/api', reportsRouter(context));
  app.use('/api/preferences', requireUser, preferencesRouter(context));
  app.use('/api/solve', solveRouter(log));
  if (context.devPages) app.use('/api/dev/mailbox', requireUser, mailboxRouter(context));
  app.use('/api', notFoundApi);

  const clientDir = path.resolve(REPO_ROOT, env.CLIENT_DIST);
  if (existsSync(path.join(clientDir, 'index.html'))) {
    app.use(express.static(clientDir, { index: false, maxAge: '1h', setHeaders: immutableAssets }));
    app.get('/{*path}', (_req, res) => res.sendFile(path.join(clientDir, 'index.html')));
  } else {
    app.get('/{*path}', (_req, res) => {
      res.status(503).type('text').send('The client is not built yet: run `npm run build` (npm start does this for you).');
    });
  }

  app.use(errorMiddleware(log));
  return {
    app,
    session: session.middleware,
    passportMiddleware,
    context,
    close: () => {
      session.close();
      if (!mailer) ownMailer.close();
    },
  };
}

/** Vite puts a content hash in every file under assets/, so those can be cached for a year. */
function immutableAssets(res: express.Response, filePath: string): void {
  if (filePath.includes(`${path.sep}assets${path.sep}`)) res.setHeader('Cache-Control', 'public, max-age=31536000, immutable');
}
