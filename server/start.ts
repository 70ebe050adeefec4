// Wires a running server: context, app, HTTP server; used by server/index.ts and by tests
// that need a real listening server (browser tests, sockets).
import { EventEmitter } from 'node:events';
import { createServer, type Server } from 'node:http';
import type { Server as SocketServer } from 'socket.io';
import type { Config } from './config';
import type { AppContext } from './context';
import { createApp } from './app';
import { openCluster } from './cluster';
import { relayEvents } from './cluster/event-relay';
import { createDatabase, migrate } from './db';
import { settleDeferred } from './deferred';
import { createLogger } from './logger';
import { createMailer } from './mail/mailer';
import { createTextSender } from './sms/sender';
import { attachRealtime } from './realtime';
import { recoverInterruptedImports } from './services/imports';
import { openFirstOwnerSetup } from './services/first-owner';
import { attachFlagRules } from './services/flags';
import { attachTextQueue } from './services/flag-texts';
import { attachFrostWatch } from './services/frost';
import { startSessionPurge } from './services/sessions';

export interface RunningServer {
  ctx: AppContext;
  io: SocketServer;
  http: Server;
  port: number;
  /** With no organisation in the database, the one-time link that makes the first owner (a new one each start); else null. */
  firstOwnerLink: string | null;
  close(): Promise<void>;
}

export function createContext(config: Config): AppContext {
  const logger = createLogger(config);
  return { config, logger, db: createDatabase(config, { logger }), mailer: createMailer(config), texts: createTextSender(config), events: new EventEmitter() };
}

/** Migrates, opens the first-owner set-up of an empty database, builds the app and listens on config.host:config.port (0 picks a free port). */
export async function startServer(config: Config, opts: { staticDir?: string } = {}): Promise<RunningServer> {
  const ctx = createContext(config);
  // Before the app: its sign-in limits and kept rows go through what the processes share (Redis, when set).
  ctx.cluster = await openCluster(config, ctx.logger);
  const stopRelay = relayEvents(ctx);
  await migrate(ctx.db.sequelize);
  // An import cut off by a crash rolled back with its transaction: mark it failed so it can be retried.
  const interrupted = await recoverInterruptedImports(ctx);
  if (interrupted) ctx.logger.warn(`${interrupted} interrupted logger import(s) marked failed`);
  const firstOwnerLink = await openFirstOwnerSetup(ctx);
  const app = createApp(ctx, opts);
  const http = createServer(app);
  const io = attachRealtime(ctx, http, app.locals.sessionMiddleware);
  const stopFlagRules = attachFlagRules(ctx);
  const stopTextQueue = attachTextQueue(ctx);
  const stopFrostWatch = attachFrostWatch(ctx);
  const stopSessionPurge = startSessionPurge(ctx);
  await new Promise<void>((resolve, reject) => {
    http.once('error', reject);
    http.listen(config.port, config.host, () => resolve());
  });
  const address = http.address();
  const port = typeof address === 'object' && address ? address.port : config.port;
  return {
    ctx,
    io,
    http,
    port,
    firstOwnerLink,
    async close() {
      stopFlagRules();
      stopTextQueue();
      stopFrostWatch();
      stopSessionPurge();
      await io.close();
      http.closeAllConnections();
      await new Promise<void>((r) => http.close(() => r()));
      // Mail queued by the last requests still goes out.
      await settleDeferred(ctx);
      ctx.mailer.close();
      stopRelay();
      await ctx.cluster?.close();
      await ctx.db.sequelize.close();
    },
  };
}
