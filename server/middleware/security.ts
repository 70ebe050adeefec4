// Sessions in MariaDB, CSRF protection for cookie-authenticated writes, security headers.
import type { Request, RequestHandler, Response } from 'express';
import session from 'express-session';
import connectSessionSequelize from 'connect-session-sequelize';
import helmet from 'helmet';
import { csrfSync } from 'csrf-sync';
import { doubleCsrf } from 'csrf-csrf';
import type { AppContext } from '../context';
import { AppError } from '../errors';
import { keepSessionReads } from '../services/signed-in-cache';

/** CSRF tokens: a token kept in the session once someone is signed in, a signed cookie before that. */
export interface CsrfTools {
  /** The token for the next writes; `fresh` replaces any earlier one (at sign-in). */
  generateToken(req: Request, res: Response, fresh?: boolean): string;
  protect: RequestHandler;
}

/** The app's own origin in its WebSocket form (http → ws, https → wss), for the CSP's connect-src. */
export function socketOrigin(publicUrl: string): string {
  const url = new URL(publicUrl);
  return `${url.protocol === 'https:' ? 'wss:' : 'ws:'}//${url.host}`;
}

export function securityHeaders(config: Pick<AppContext['config'], 'publicUrl'>): RequestHandler {
  return helmet({
    contentSecurityPolicy: {
      directives: {
        defaultSrc: ["'self'"],
        scriptSrc: ["'self'"],
        // PrimeVue's theme writes <style> elements at run time.
        styleSrc: ["'self'", "'unsafe-inline'"],
        imgSrc: ["'self'", 'data:', 'blob:'],
        fontSrc: ["'self'", 'data:'],
        // Only the app's own origin, and the same origin over WebSocket (socket.io).
        connectSrc: ["'self'", socketOrigin(config.publicUrl)],
        objectSrc: ["'none'"],
        frameAncestors: ["'none'"],
        upgradeInsecureRequests: null,
      },
    },
  });
}

export function sessions(ctx: AppContext): RequestHandler {
  const Store = connectSessionSequelize(session.Store);
  const store = new Store({
    db: ctx.db.sequelize,
    table: 'Session',
    checkExpirationInterval: 0,
    expiration: ctx.config.session.idleMs,
    extendDefaultFields: (defaults: { data: string; expires: Date }, s: { userId?: number }) => ({
      data: defaults.data,
      expires: defaults.expires,
      userId: s.userId ?? null,
    }),
  });
  keepSessionReads(ctx, store);
  // A rolling session is touched on every request; writing its new expiry at most once a minute
  // per session keeps reads (the board, polling clients) from costing a database write each.
  const touchedAt = new Map<string, number>();
  const touch = store.touch.bind(store);
  store.touch = (sid: string, data: session.SessionData, done?: (err?: unknown) => void) => {
    const now = Date.now();
    if (now - (touchedAt.get(sid) ?? 0) < 60_000) return done?.();
    if (touchedAt.size >= 100_000) touchedAt.clear();
    touchedAt.set(sid, now);
    return touch(sid, data, done);
  };
  return session({
    name: ctx.config.session.cookieName,
    secret: ctx.config.session.secret,
    store,
    resave: false,
    saveUninitialized: false,
    rolling: true,
    proxy: ctx.config.session.secureCookie,
    cookie: { httpOnly: true, sameSite: 'lax', secure: ctx.config.session.secureCookie, maxAge: ctx.config.session.idleMs },
  });
}

/** Answers from the API carry personal and farm data: no browser or proxy may keep a copy. */
export function noStore(): RequestHandler {
  return (_req, res, next) => {
    res.set('Cache-Control', 'no-store');
    next();
  };
}

/**
 * Signed in: the synchroniser token pattern (the token lives in the session row that exists anyway).
 * Signed out (sign-in, reset, set-password forms): a signed double-submit cookie, so a visitor costs no
 * session row (OWASP Cross-Site Request Forgery Prevention Cheat Sheet, "Signed Double-Submit Cookie").
 */
export function csrfTools(config: Pick<AppContext['config'], 'session'>): CsrfTools {
  const inSession = csrfSync({
    getTokenFromRequest: (req) => req.get('x-csrf-token'),
    errorConfig: { statusCode: 403, message: 'csrf_invalid', code: 'EBADCSRFTOKEN' },
  });
  const { secureCookie, secret } = config.session;
  const signedOut = doubleCsrf({
    getSecret: () => secret,
    getSessionIdentifier: () => 'signed-out',
    cookieName: secureCookie ? '__Host-brimstock.csrf' : 'brimstock.csrf',
    cookieOptions: { sameSite: 'lax', path: '/', secure: secureCookie, httpOnly: true },
    getCsrfTokenFromRequest: (req) => req.get('x-csrf-token'),
  });
  const signedIn = (req: Request) => Boolean(req.session?.userId);
  return {
    generateToken: (req, res, fresh = false) => (signedIn(req) ? inSession.generateToken(req, fresh) : signedOut.generateCsrfToken(req, res, { overwrite: fresh })),
    protect: (req, res, next) => (signedIn(req) ? inSession.csrfSynchronisedProtection(req, res, next) : signedOut.doubleCsrfProtection(req, res, next)),
  };
}

/** Rejects writes without the session's CSRF token (403 csrf_invalid). */
export function csrfProtection(csrf: CsrfTools): RequestHandler {
  return (req, res, next) => {
    csrf.protect(req, res, (err?: unknown) => {
      if (err) return next(new AppError(403, 'csrf_invalid', 'The form has expired; reload the page and try again'));
      next();
    });
  };
}
