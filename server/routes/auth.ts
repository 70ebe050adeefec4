import { Router, type Request, type Response } from 'express';
import { passwordResetSchema, profileSchema, setPasswordSchema, signInSchema, type SessionState } from '@shared/schemas';
import { clusterOf } from '../cluster';
import type { AppContext } from '../context';
import { actorOf, requireSignIn } from '../middleware/access';
import { describeToken, endSession, requestPasswordReset, sessionUserFor, setPasswordWithToken, verifySignIn } from '../services/auth';
import { adoptBrowserLanguage, updateProfile } from '../services/profile';
import { browserLanguageOf } from '../i18n';
import { textFailuresOf } from '../services/flag-text-replies';
import { parse } from '../validate';
import { authLimits } from '../middleware/rate-limits';
import type { CsrfTools } from '../middleware/security';

function regenerate(req: Request): Promise<void> {
  return new Promise((resolve, reject) => req.session.regenerate((err) => (err ? reject(err) : resolve())));
}

export async function startSession(ctx: AppContext, req: Request, res: Response, csrf: CsrfTools, userId: number): Promise<SessionState> {
  // The first sign-in takes the browser's language (its Accept-Language) until the person chooses one.
  const browserLanguage = browserLanguageOf(req);
  if (browserLanguage) await adoptBrowserLanguage(ctx, userId, browserLanguage);
  await regenerate(req);
  req.session.userId = userId;
  req.session.signedInAt = Date.now();
  const user = await sessionUserFor(ctx, userId);
  return { user, csrfToken: csrf.generateToken(req, res, true) };
}

export function authRouter(ctx: AppContext, csrf: CsrfTools) {
  const router = Router();
  const limits = authLimits(ctx.config, clusterOf(ctx).limitStoreFor);
  const perIp = limits.perIp;

  router.get('/session', async (req, res) => {
    const body: SessionState = { user: req.actor ?? null, csrfToken: csrf.generateToken(req, res) };
    res.json(body);
  });

  router.get('/me', requireSignIn, (req, res) => {
    res.json(actorOf(req));
  });

  router.post('/sign-in', ...limits.signIn, async (req, res) => {
    const input = parse(signInSchema, req.body);
    const user = await verifySignIn(ctx, input.email, input.password);
    res.json(await startSession(ctx, req, res, csrf, user.id));
  });

  router.post('/sign-out', async (req, res) => {
    const sid = req.sessionID;
    // express-session forgets the session; the service makes sure its row is gone and closes its sockets.
    await new Promise<void>((r) => req.session.destroy(() => r()));
    await endSession(ctx, sid);
    res.clearCookie(ctx.config.session.cookieName);
    res.status(204).end();
  });

  router.patch('/me', requireSignIn, async (req, res) => {
    const actor = actorOf(req);
    res.json(await updateProfile(ctx, actor, parse(profileSchema, req.body)));
  });

  router.get('/me/text-failures', requireSignIn, async (req, res) => {
    res.json({ failures: await textFailuresOf(ctx, actorOf(req)) });
  });

  router.post('/password-reset', perIp, async (req, res) => {
    const { email } = parse(passwordResetSchema, req.body);
    requestPasswordReset(ctx, email);
    res.status(202).json({});
  });

  router.get('/tokens/:token', async (req, res) => {
    res.json(await describeToken(ctx, String(req.params.token)));
  });

  router.post('/set-password', perIp, async (req, res) => {
    const input = parse(setPasswordSchema, req.body);
    const user = await setPasswordWithToken(ctx, input.token, input.password, input.name);
    res.json(await startSession(ctx, req, res, csrf, user.id));
  });

  return router;
}
