// Limits on failed sign-ins and link requests (express-rate-limit). Each limiter is named; its
// counts live in the store `storeFor(name)` gives, the library's in-memory store by default. To
// count across several server processes the routes pass `clusterOf(ctx).limitStoreFor`
// (server/cluster): with REDIS_URL set, a rate-limit-redis store per limiter, its keys prefixed
// with the limiter's name, so every process counts the same failures.
import type { Request, RequestHandler } from 'express';
import rateLimit, { ipKeyGenerator, type Store } from 'express-rate-limit';
import type { Config } from '../config';
import { AppError } from '../errors';

export type LimitStoreFor = (name: string) => Store | undefined;

interface LimitRule {
  name: string;
  limit: number;
  windowMs: number;
  key: (req: Request) => string;
}

/** The client's address as a limit key (IPv6 grouped by /56, as express-rate-limit advises). */
const addressOf = (req: Request) => ipKeyGenerator(req.ip ?? '');
/** The account a sign-in names: its e-mail address as the schema will read it. */
const accountOf = (req: Request) => String(req.body?.email ?? '').trim().toLowerCase();

function limiter(rule: LimitRule, storeFor: LimitStoreFor): RequestHandler {
  return rateLimit({
    windowMs: rule.windowMs,
    limit: rule.limit,
    keyGenerator: rule.key,
    // Only failures count: a person who gets in is never held back by their own earlier typos.
    skipSuccessfulRequests: true,
    standardHeaders: 'draft-8',
    legacyHeaders: false,
    store: storeFor(rule.name),
    handler: () => {
      throw new AppError(429, 'rate_limited', 'Too many sign-in attempts; wait a few minutes and try again');
    },
  });
}

/**
 * The limits of the auth routes. `perIp`: failures from one address, whatever the account (also
 * on link requests and setting a password). `signIn`, in order: that one; failures on one account
 * from one address (the strict one, over the long window: it stops a guesser without locking the
 * person out from their own address); and failures on one account from anywhere (looser, over a
 * short back-off, against guessing spread over many addresses).
 */
export function authLimits(config: Pick<Config, 'signInLimits'>, storeFor: LimitStoreFor = () => undefined): { perIp: RequestHandler; signIn: RequestHandler[] } {
  const c = config.signInLimits;
  const perIp = limiter({ name: 'ip', limit: c.perIp, windowMs: c.windowMs, key: (req) => `ip:${addressOf(req)}` }, storeFor);
  return {
    perIp,
    signIn: [
      perIp,
      limiter({ name: 'account-ip', limit: c.perAccountAndIp, windowMs: c.windowMs, key: (req) => `acct-ip:${accountOf(req)}|${addressOf(req)}` }, storeFor),
      limiter({ name: 'account', limit: c.perAccount, windowMs: c.accountWindowMs, key: (req) => `acct:${accountOf(req)}` }, storeFor),
    ],
  };
}
