import { existsSync } from 'node:fs';
import path from 'node:path';
import express, { type Express } from 'express';
import { adminRoutes } from './admin/admin.routes';
import { createAdminUsecases } from './admin/admin.usecases';
import { accountRoutes, authRoutes } from './auth/auth.routes';
import { createAuthUsecases } from './auth/auth.usecases';
import { createLucia } from './auth/lucia';
import { createPasswordResetsRepository } from './auth/password-resets.repository';
import { createPasswordHasher } from './auth/passwords';
import { type AuthLimits, createAuthLimiters } from './auth/auth-limits';
import { loadSession } from './auth/session-middleware';
import { createSignUpRequestsRepository } from './auth/sign-up-requests.repository';
import { createSignUpUsecases } from './auth/sign-up.usecases';
import type { AppConfig } from './config';
import type { Db } from './db/client';
import { createTransact } from './db/transact';
import { devRoutes } from './dev/dev.routes';
import { errorMiddleware, type ErrorReporter } from './http/error-middleware';
import { healthRoutes } from './http/health.routes';
import { routeNotFound } from './http/http.errors';
import { allowedOrigins, requireKnownHost, requireSameOrigin } from './http/origin';
import { jsonBody, rejectMalformedUrl } from './http/request-shape';
import { requestLog } from './http/request-log';
import { noStore, securityHeaders } from './http/security-headers';
import { type Logger, loggableError, silentLogger } from './logger';
import type { MailboxReader } from './mail/mail-fake';
import type { Mailer } from './mail/mailer';
import { isFileUpload } from './http/file-upload';
import { createSheetFeatures, sheetFeatureRoutes } from './sheets/sheet-features';
import { createUsersRepository } from './users/users.repository';

export interface AppDeps {
  db: Db;
  mailer: Mailer;
  /** The in-process mail fake, for the development mailbox route. */
  mailbox?: MailboxReader;
  config: AppConfig;
  /** Sign-in, sign-up and reset limits (counted in PostgreSQL); AUTH_LIMITS by default. */
  limits?: Partial<AuthLimits>;
  /** Request lines and unexpected errors; silent by default (start.ts and dev.ts pass one). */
  logger?: Logger;
  /** Where unexpected errors go; the logger by default. */
  report?: ErrorReporter;
}

/** Builds the Express app from its dependencies; listening is the caller's business. */
export function createApp(deps: AppDeps): Express {
  const { db, mailer, config } = deps;
  const logger = deps.logger ?? silentLogger;
  const report: ErrorReporter =
    deps.report ?? ((error) => logger.error({ err: loggableError(error) }, 'unexpected error'));
  const lucia = createLucia({ db, secureCookies: config.secureCookies });
  const users = createUsersRepository({ db });
  const hasher = createPasswordHasher();
  const limiters = createAuthLimiters(db, deps.limits);
  const auth = createAuthUsecases({
    users,
    resets: createPasswordResetsRepository({ db }),
    lucia,
    hasher,
    mailer,
    limiters,
    report,
  });
  const signUp = createSignUpUsecases({
    users,
    requests: createSignUpRequestsRepository({ db }),
    lucia,
    hasher,
    mailer,
    limiters,
    report,
  });
  const sheetFeatures = createSheetFeatures({ db, mailer, report });
  const admin = createAdminUsecases({
    users,
    transact: createTransact(db, (tx) => createUsersRepository({ db: tx })),
  });

  const origins = allowedOrigins(config.appOrigin);

  const app = express();
  app.disable('x-powered-by');
  // Which proxies may name the client in X-Forwarded-For (TRUST_PROXY); none by default.
  app.set('trust proxy', config.trustProxy ?? false);
  app.use(requestLog(logger));
  app.use(securityHeaders());
  app.use(requireKnownHost(origins));
  app.use(rejectMalformedUrl());

  const api = express.Router();
  api.use(noStore());
  api.use(jsonBody({ limit: '2mb', multipartAt: isFileUpload }));
  api.use(requireSameOrigin(origins));
  // Before the session lookup: health must answer 503, not fail, when the database is down.
  api.use('/health', healthRoutes({ db }));
  api.use(loadSession(lucia));
  api.use('/auth', authRoutes({ auth, signUp, appOrigin: config.appOrigin }));
  api.use('/account', accountRoutes({ auth }));
  api.use('/admin', adminRoutes({ admin }));
  api.use(sheetFeatureRoutes(sheetFeatures, { appOrigin: config.appOrigin }));
  if (deps.mailbox && config.nodeEnv !== 'production') api.use('/dev', devRoutes({ mailbox: deps.mailbox }));
  api.use((_req, _res, next) => next(routeNotFound()));
  app.use('/api', api);

  if (config.clientDir) serveClient(app, config.clientDir);
  app.use(errorMiddleware(report));
  return app;
}

/** The built client, with every other GET answered by index.html so the client's router takes over. */
function serveClient(app: Express, clientDir: string) {
  const indexHtml = path.join(clientDir, 'index.html');
  app.use(
    '/assets',
    express.static(path.join(clientDir, 'assets'), { immutable: true, maxAge: '1y', fallthrough: false }),
  );
  app.use(express.static(clientDir, { index: false }));
  app.use((req, res, next) => {
    if ((req.method !== 'GET' && req.method !== 'HEAD') || !existsSync(indexHtml)) {
      next();
      return;
    }
    res.setHeader('Cache-Control', 'no-cache');
    res.sendFile(indexHtml);
  });
}
