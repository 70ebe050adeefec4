// Access control at the door: who is signed in (kept in memory only until a user, farm or access
// row is written, so role changes and deactivation apply at once) and the role gates. The farm scope
// every query goes through is assertFarmAccess in services/access.ts.
import type { NextFunction, Request, Response } from 'express';
import type { Role, SessionUser } from '@shared/schemas';
import type { AppContext } from '../context';
import { AppError, forbidden } from '../errors';
import { keptSessionUser } from '../services/signed-in-cache';

declare module 'express-session' {
  interface SessionData {
    userId?: number;
    signedInAt?: number;
  }
}
declare module 'express-serve-static-core' {
  interface Request {
    actor?: SessionUser;
  }
}

/** Loads `req.actor` from the session; ends sessions of deactivated users and those past the absolute timeout. */
export function loadActor(ctx: AppContext) {
  return async (req: Request, _res: Response, next: NextFunction) => {
    const { userId, signedInAt } = req.session ?? {};
    if (!userId) return next();
    const expired = !signedInAt || Date.now() - signedInAt > ctx.config.session.absoluteMs;
    const actor = expired ? null : await keptSessionUser(ctx, userId);
    if (!actor) {
      await new Promise<void>((r) => req.session.destroy(() => r()));
      return next();
    }
    req.actor = actor;
    next();
  };
}

/** The signed-in user, or a 401. */
export function actorOf(req: Request): SessionUser {
  if (!req.actor) throw new AppError(401, 'unauthenticated', 'Sign in first');
  return req.actor;
}

/** Middleware: only signed-in users with one of these roles pass (401 / 403 otherwise). */
export function requireRole(...roles: Role[]) {
  return (req: Request, _res: Response, next: NextFunction) => {
    const actor = actorOf(req);
    if (roles.length && !roles.includes(actor.role)) throw forbidden(`This needs the ${roles.join(' or ')} role`);
    next();
  };
}

/** Middleware: any signed-in user. */
export const requireSignIn = requireRole();
