// Builds the Express app (no listening here: tests drive it with supertest).
import { existsSync } from 'node:fs';
import { basename, join } from 'node:path';
import compression from 'compression';
import cookieParser from 'cookie-parser';
import express, { type ErrorRequestHandler, type Router } from 'express';
import { pinoHttp } from 'pino-http';
import type { AppContext } from './context';
import { AppError } from './errors';
import { errorIn, requestLanguage, applyCatalogueMessages } from './i18n';
import { DATABASE_RETRY_AFTER_S, isDatabaseUnavailable } from './db-errors';
import { requestLogSerializers } from './logger';
import { loadActor } from './middleware/access';
import { refuseUnstorableText, rememberNotUtf8 } from './middleware/json-text';
import { csrfProtection, csrfTools, noStore, securityHeaders, sessions } from './middleware/security';
import { authRouter } from './routes/auth';
import { devRouter } from './routes/dev';
import { farmsRouter } from './routes/farms';
import { healthRouter } from './routes/health';
import { invitationsRouter, peopleRouter } from './routes/people';
import { tanksRouter } from './routes/tanks';
import { readingsRouter, roundsRouter, tankReadingsRouter } from './routes/readings';
import { boardRouter } from './routes/board';
import { inputsRouter, ordersRouter, suppliersRouter } from './routes/inventory';
import { flagsRouter } from './routes/flags';
import { brewsRouter } from './routes/brews';
import { importsRouter, tankImportMappingRouter } from './routes/imports';
import { setupRouter } from './routes/setup';
import { organisationRouter } from './routes/organisation';
import { textWebhooksRouter } from './routes/texts';
import { invalidateBoards } from './services/board';

export function createApp(ctx: AppContext, opts: { staticDir?: string } = {}) {
  applyCatalogueMessages();
  const app = express();
  app.disable('x-powered-by');
  app.set('trust proxy', ctx.config.proxyHops || false);
  app.use(securityHeaders(ctx.config));
  app.use(compression());
  app.use(pinoHttp({ logger: ctx.logger, serializers: requestLogSerializers(ctx.logger), autoLogging: { ignore: (req) => req.url === '/api/health' } }));

  const api = express.Router();
  const csrf = csrfTools(ctx.config);
  api.use(noStore());
  api.use('/health', healthRouter(ctx));
  // The SMS service's webhooks: form posts signed by the service, so before sessions and CSRF.
  const webhookMounts: [string, Router][] = [['/texts', textWebhooksRouter(ctx)]];
  for (const [prefix, router] of webhookMounts) api.use(prefix, router);
  api.use(express.json({ limit: '1mb', verify: rememberNotUtf8 }));
  // Text that could not be stored as sent (NUL, bytes that are not UTF-8) is refused here for every route.
  api.use(refuseUnstorableText());
  const sessionMiddleware = sessions(ctx);
  app.locals.sessionMiddleware = sessionMiddleware;
  api.use(sessionMiddleware);
  api.use(cookieParser());
  api.use(csrfProtection(csrf));
  api.use(loadActor(ctx));
  // Any write may change what a board shows: kept boards are rebuilt after it.
  api.use((req, res, next) => {
    if (req.method !== 'GET' && req.method !== 'HEAD') res.once('finish', () => invalidateBoards(ctx));
    next();
  });
  // Each resource under its own prefix; a tank's readings and import mapping are further routers under /tanks.
  const mounts: [string, Router][] = [
    ['/auth', authRouter(ctx, csrf)],
    ['/setup', setupRouter(ctx, csrf)],
    ['/farms', farmsRouter(ctx)],
    ['/tanks', tanksRouter(ctx)],
    ['/tanks', tankReadingsRouter(ctx)],
    ['/tanks', tankImportMappingRouter(ctx)],
    ['/rounds', roundsRouter(ctx)],
    ['/readings', readingsRouter(ctx)],
    ['/board', boardRouter(ctx)],
    ['/suppliers', suppliersRouter(ctx)],
    ['/inputs', inputsRouter(ctx)],
    ['/orders', ordersRouter(ctx)],
    ['/organisation', organisationRouter(ctx)],
    ['/flags', flagsRouter(ctx)],
    ['/brews', brewsRouter(ctx)],
    ['/imports', importsRouter(ctx)],
    ['/people', peopleRouter(ctx)],
    ['/invitations', invitationsRouter(ctx)],
  ];
  if (ctx.config.devOutbox) mounts.push(['/dev', devRouter(ctx)]);
  for (const [prefix, router] of mounts) api.use(prefix, router);
  app.locals.apiRoutes = listRoutes([...webhookMounts, ...mounts]);
  api.use((_req, _res, next) => next(new AppError(404, 'not_found', 'No such API route')));
  app.use('/api', api);

  const staticDir = opts.staticDir ?? ctx.config.clientDir;
  if (existsSync(join(staticDir, 'index.html'))) {
    // The service worker, its Workbox runtime, the manifest and the page are checked on every load, so a new
    // version is found at once (the browser then offers it; src/offline/app-update.ts); hashed assets keep 1 h.
    const checkedEachLoad = /^(sw\.js|workbox-[\w-]+\.js|manifest\.webmanifest|index\.html)$/;
    app.use(
      express.static(staticDir, {
        index: false,
        maxAge: '1h',
        setHeaders: (res, path) => {
          if (checkedEachLoad.test(basename(path))) res.setHeader('Cache-Control', 'no-cache');
        },
      }),
    );
    app.get(/^\/(?!api\/|socket\.io\/).*/, (_req, res) => res.sendFile(join(staticDir, 'index.html'), { headers: { 'Cache-Control': 'no-cache' } }));
  }

  app.use(errorHandler(ctx));
  return app;
}

/** Every API route as "METHOD /api/path" (the access-matrix test checks each has a row). */
function listRoutes(mounts: [string, Router][]): string[] {
  const out = ['GET /api/health'];
  for (const [prefix, router] of mounts) {
    for (const layer of router.stack) {
      const route = layer.route as { path: string; methods: Record<string, boolean> } | undefined;
      if (!route) continue;
      for (const method of Object.keys(route.methods)) out.push(`${method.toUpperCase()} /api${prefix}${route.path === '/' ? '' : route.path}`);
    }
  }
  return out;
}

function errorHandler(ctx: AppContext): ErrorRequestHandler {
  return (err, req, res, _next) => {
    let status = 500;
    let body: { code: string; message: string; field?: string };
    if (err instanceof AppError) {
      status = err.status;
      body = { code: err.code, message: err.message, ...(err.field ? { field: err.field } : {}) };
    } else if (err?.type === 'entity.parse.failed') {
      status = 400;
      body = { code: 'invalid_json', message: 'The request body is not valid JSON' };
    } else if (err?.type === 'entity.too.large') {
      status = 413;
      body = { code: 'too_large', message: 'The request body is too large' };
    } else if (err?.type === 'encoding.unsupported' || err?.type === 'charset.unsupported') {
      status = 415;
      body = { code: 'unsupported_body', message: 'The request body is sent in an encoding or character set the server does not read; send plain or gzip-compressed UTF-8 JSON' };
    } else if (err?.expose === true && Number.isInteger(err.status) && err.status >= 400 && err.status < 500) {
      // Other body-reading failures the parser marks as the client's (a body that is not the gzip it claims, an aborted request).
      status = err.status;
      body = { code: 'bad_body', message: `The request body could not be read (${String(err.message).slice(0, 200)})` };
    } else if (isDatabaseUnavailable(err)) {
      status = 503;
      body = { code: 'database_down', message: 'The database is not reachable right now; try again shortly' };
    } else {
      body = { code: 'internal', message: 'Something went wrong on the server; it has been logged' };
    }
    // Every 503 is the database (or a service behind it) being away for a moment: say when to ask again.
    if (status === 503) res.set('Retry-After', String(DATABASE_RETRY_AFTER_S));
    if (status >= 500) (req.log ?? ctx.logger).error({ err }, 'request failed');
    // In the language of the person asking (their choice, else their browser's).
    body.message = errorIn(body.message, requestLanguage(req));
    res.status(status).json({ error: body });
  };
}
