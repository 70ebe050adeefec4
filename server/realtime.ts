// socket.io: the handshake is authenticated with the API's own session; the server (never the
// client) puts each socket in the rooms of the farms its user may see and in the room of that
// set of farms. Farms whose readings commit are gathered and pushed at most every THROTTLE_MS,
// in one message per farm set holding every changed farm of the set, however many commit meanwhile.
// A socket lives no longer than the session it was opened with: it closes when that session is
// signed out, ended by a password reset or deactivation, or expires (idle or absolute), and only
// the app's own origin (PUBLIC_URL) may open one.
import type { Server as HttpServer } from 'node:http';
import type { RequestHandler } from 'express';
import { Server } from 'socket.io';
import type { SessionUser } from '@shared/schemas';
import type { AppContext } from './context';
import { onEvent } from './events';
import { boardOf, stockBoard } from './services/board';
import { activeFlagsOf } from './services/flags';
import { keptSessionUser } from './services/signed-in-cache';

export const THROTTLE_MS = 100;
const farmRoom = (id: number) => `farm:${id}`;
const setPrefix = (organisationId: number) => `farms:${organisationId}:`;
const setRoom = (actor: SessionUser) => `${setPrefix(actor.organisationId)}${[...actor.farmIds].sort((a, b) => a - b).join(',')}`;
const userRoom = (id: number) => `user:${id}`;
const sessionRoom = (sid: string) => `session:${sid}`;
/** How often sockets whose session may have expired are looked at. */
const EXPIRY_SWEEP_MS = 500;
/** How long an ended session is remembered, for handshakes that were under way when it ended. */
const ENDED_KEEP_MS = 60_000;

/** The session a socket was opened with, and when it ends as far as the socket knows. */
interface SocketSession {
  sid: string;
  userId: number;
  /** The store row's expiry when last read; HTTP use moves the row's on, so it is read again once this passes. */
  idleEndsAt: number;
  /** signedInAt + the absolute session length. */
  endsAt: number;
  /** When the handshake started checking the session: a session ended after this never gets the socket. */
  checkedAt: number;
}

export function attachRealtime(ctx: AppContext, http: HttpServer, sessionMiddleware: RequestHandler): Server {
  const ownOrigin = new URL(ctx.config.publicUrl).origin;
  const io = new Server(http, {
    serveClient: false,
    path: '/socket.io',
    // Browsers always send Origin on a WebSocket and on cross-origin requests; a client without one
    // (not a browser) carries no one else's cookie.
    allowRequest: (req, done) => {
      const origin = req.headers.origin;
      done(origin && origin !== ownOrigin ? 'origin not allowed' : null, !origin || origin === ownOrigin);
    },
  });
  io.engine.use(sessionMiddleware);

  // Sessions (by id) and users (all their sessions) that ended lately, and when.
  const ended = new Map<string, number>();
  const endedSince = (s: SocketSession) => Math.max(ended.get(sessionRoom(s.sid)) ?? 0, ended.get(userRoom(s.userId)) ?? 0) >= s.checkedAt;

  io.use(async (socket, next) => {
    const req = socket.request as unknown as { sessionID?: string; session?: { userId?: number; signedInAt?: number } };
    const { sessionID: sid, session } = req;
    const checkedAt = Date.now();
    const endsAt = (session?.signedInAt ?? 0) + ctx.config.session.absoluteMs;
    let actor: SessionUser | null = null;
    let idleEndsAt = 0;
    try {
      if (sid && session?.userId && endsAt > checkedAt) {
        const row = await ctx.db.models.Session.findByPk(sid, { attributes: ['expires'] });
        idleEndsAt = row ? (row.expires?.getTime() ?? Infinity) : 0;
        if (idleEndsAt > Date.now()) actor = await keptSessionUser(ctx, session.userId);
      }
    } catch (err) {
      ctx.logger.error({ err }, 'socket sign-in check failed');
      return next(new Error('unavailable'));
    }
    if (!actor || !sid) return next(new Error('unauthenticated'));
    socket.data.actor = actor;
    socket.data.session = { sid, userId: actor.id, idleEndsAt, endsAt, checkedAt } satisfies SocketSession;
    next();
  });

  const joinRooms = async (socket: import('socket.io').Socket, actor: SessionUser) => {
    for (const room of socket.rooms) if (room.startsWith('farm:') || room.startsWith('farms:')) await socket.leave(room);
    await socket.join([userRoom(actor.id), setRoom(actor), ...actor.farmIds.map(farmRoom)]);
  };

  // A failed board read (database gone for a moment) must not end the process: the socket is
  // dropped and the client reconnects for a fresh board.
  const failed = (socket: import('socket.io').Socket) => (err: unknown) => {
    ctx.logger.error({ err }, 'board for a socket failed');
    socket.disconnect(true);
  };
  io.on('connection', (socket) => {
    const actor = socket.data.actor as SessionUser;
    const session = socket.data.session as SocketSession;
    // The session may have ended while the handshake was being checked.
    if (endedSince(session)) return void socket.disconnect(true);
    void socket.join([sessionRoom(session.sid), userRoom(session.userId)]);
    void (async () => {
      await joinRooms(socket, actor);
      socket.emit('board', await stockBoard(ctx, actor));
    })().catch(failed(socket));
    // A client that lost its connection (or suspects it missed pushes) asks for the whole board again;
    // access is re-read so changed farm access applies.
    socket.on('board:resync', () => {
      void (async () => {
        const now = await keptSessionUser(ctx, actor.id);
        if (!now) return void socket.disconnect(true);
        socket.data.actor = now;
        await joinRooms(socket, now);
        socket.emit('board', await stockBoard(ctx, now));
      })().catch(failed(socket));
    });
  });

  /** The changed farms of one organisation, sent to every farm set that holds some of them. */
  const pushFarms = async (organisationId: number, farmIds: number[]) => {
    const board = await boardOf(ctx, organisationId, farmIds);
    const byId = new Map(board.farms.map((f) => [f.farmId, f]));
    // A farm with no tanks left (or archived meanwhile) goes out empty, so it leaves the board.
    const farms = farmIds.map((farmId) => byId.get(farmId) ?? { farmId, name: '', totals: [], tanks: [] });
    const prefix = setPrefix(organisationId);
    for (const room of io.of('/').adapter.rooms.keys()) {
      if (!room.startsWith(prefix)) continue;
      const visible = new Set(room.slice(prefix.length).split(',').map(Number));
      const theirs = farms.filter((f) => visible.has(f.farmId));
      if (theirs.length) io.to(room).emit('board:farms', theirs);
    }
  };
  const dirty = new Map<number, Set<number>>();
  let timer: NodeJS.Timeout | null = null;
  let lastFlushAt = 0;
  let flushing = false;
  // One flush at a time: what changes while one runs is gathered into the next, so pushes never
  // queue up behind each other and a slower earlier board never overtakes a later one.
  const flush = async () => {
    timer = null;
    flushing = true;
    lastFlushAt = Date.now();
    const batch = [...dirty.entries()];
    dirty.clear();
    for (const [organisationId, farms] of batch) await pushFarms(organisationId, [...farms]).catch((err) => ctx.logger.error({ err }, 'board push failed'));
    flushing = false;
    if (dirty.size) arm();
  };
  // Leading edge: a change after a quiet spell goes out at once; later ones within the window are gathered.
  const arm = () => {
    if (timer || flushing) return;
    timer = setTimeout(() => void flush(), Math.max(0, lastFlushAt + THROTTLE_MS - Date.now()));
  };
  const schedule = (organisationId: number, farmId: number) => {
    let farms = dirty.get(organisationId);
    if (!farms) dirty.set(organisationId, (farms = new Set()));
    farms.add(farmId);
    arm();
  };

  const onReadings = ({ organisationId, farmIds }: { organisationId: number; farmIds: number[] }) => {
    for (const id of farmIds) schedule(organisationId, id);
  };
  const onUserChanged = ({ userId }: { userId: number }) => {
    io.in(userRoom(userId)).disconnectSockets(true);
  };
  const onUserEvent = ({ userId, event, payload }: { userId: number; event: string; payload: unknown }) => {
    io.to(userRoom(userId)).emit(event, payload);
  };
  const onFlags = async ({ organisationId, farmIds }: { organisationId: number; farmIds: number[] }) => {
    for (const farmId of farmIds) {
      const flags = await activeFlagsOf(ctx, organisationId, farmId).catch((err) => (ctx.logger.error({ err }, 'flag push failed'), null));
      if (flags) io.to(farmRoom(farmId)).emit('flags:farm', { farmId, flags });
    }
  };
  ctx.events.on('flags', onFlags);
  ctx.events.on('readings', onReadings);
  // Newer cached use rates (computed off the request path) change days of cover: push those farms too.
  ctx.events.on('forecasts', onReadings);
  ctx.events.on('user-changed', onUserChanged);
  ctx.events.on('user-event', onUserEvent);

  const stopSessionEnded = onEvent(ctx, 'session-ended', (what) => {
    const room = 'sid' in what ? sessionRoom(what.sid) : userRoom(what.userId);
    ended.set(room, Date.now());
    io.in(room).disconnectSockets(true);
  });

  // Sockets whose known expiry has passed: an absolute expiry closes them; an idle one only once
  // the store row, read again, says so (HTTP use since the handshake may have moved it on).
  let sweeping = false;
  const sweep = async () => {
    const now = Date.now();
    for (const [key, at] of ended) if (now - at > ENDED_KEEP_MS) ended.delete(key);
    const idle: { socket: import('socket.io').Socket; session: SocketSession }[] = [];
    for (const socket of io.of('/').sockets.values()) {
      const session = socket.data.session as SocketSession;
      if (now >= session.endsAt) socket.disconnect(true);
      else if (now >= session.idleEndsAt) idle.push({ socket, session });
    }
    if (!idle.length) return;
    const sids = [...new Set(idle.map((s) => s.session.sid))];
    const rows = await ctx.db.models.Session.findAll({ where: { sid: sids }, attributes: ['sid', 'expires'] });
    const expiry = new Map(rows.map((r) => [r.sid, r.expires?.getTime() ?? Infinity]));
    const at = Date.now();
    for (const { socket, session } of idle) {
      const idleEndsAt = expiry.get(session.sid) ?? 0;
      if (idleEndsAt <= at) socket.disconnect(true);
      else session.idleEndsAt = idleEndsAt;
    }
  };
  const sweeper = setInterval(() => {
    if (sweeping) return;
    sweeping = true;
    sweep()
      .catch((err) => ctx.logger.error({ err }, 'session expiry sweep failed'))
      .finally(() => (sweeping = false));
  }, EXPIRY_SWEEP_MS);
  sweeper.unref();

  // io.close() ends with closing the HTTP server.
  http.once('close', () => {
    ctx.events.off('flags', onFlags);
    ctx.events.off('readings', onReadings);
    ctx.events.off('forecasts', onReadings);
    ctx.events.off('user-changed', onUserChanged);
    ctx.events.off('user-event', onUserEvent);
    stopSessionEnded();
    clearInterval(sweeper);
    if (timer) clearTimeout(timer);
  });
  return io;
}
