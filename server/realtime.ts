// socket.io: the handshake is authenticated with the API's own session; the server (never the
// client) puts each socket in the rooms of the farms its user may see and in the room of that
// set of farms. Farms whose readings commit are gathered and pushed at most every THROTTLE_MS: one
// numbered delta per farm set (only what changed of the tiles; receivers work the totals out), built once and
// sent to the set's room, however many commits came meanwhile. On each connection the socket is told
// where its set's stream stands (`board:stream`); the client fetches GET /api/board and applies the
// deltas numbered after the board's. Event names and payloads come from shared/schemas/board-delta.ts.
// A socket lives no longer than the session it was opened with: it closes when that session is
// signed out, ended by a password reset or deactivation, or expires (idle or absolute), and only
// the app's own origin (PUBLIC_URL) may open one.
// With several server processes (Redis, server/cluster) socket.io runs on the Redis adapter, so a
// room's push reaches its sockets on every process; the farm sets watched anywhere are listed in
// Redis (cluster/farm-sets.ts), so the process where a change happened builds the one delta of
// each set for all of them.
import type { Server as HttpServer } from 'node:http';
import type { RequestHandler } from 'express';
import { Server } from 'socket.io';
import { clusterOf } from './cluster';
import { redisLease } from './cluster/lease';
import { WATCH_RENEW_MS } from './cluster/farm-sets';
import type { ServerEventPayload, SessionUser } from '@shared/schemas';
import type { AppContext } from './context';
import { onEvent, type BoardChange, type RealtimeServer, type RealtimeSocket, type SocketSession } from './events';
import { createDeltaBuilder, type WatchedSet } from './services/board-deltas';
import { farmSetKey, streamPosition } from './services/board-sequences';
import { activeFlagsOf } from './services/flags';
import { keptSessionUser } from './services/signed-in-cache';
import { answerTimingRequests, recordTiming } from './timings';

export const THROTTLE_MS = 100;
/** The bus topic on which each process tells the others (the delta builder among them) which farms changed. */
const CHANGED_TOPIC = 'board-changed';
/** How long after a push that failed it is tried again. */
const RETRY_MS = 1_000;
const farmRoom = (id: number) => `farm:${id}`;
const SET_ROOM = 'farms:';
const setPrefix = (organisationId: number) => `${SET_ROOM}${organisationId}:`;
const setRoom = (actor: SessionUser) => `${SET_ROOM}${farmSetKey(actor.organisationId, actor.farmIds)}`;
const userRoom = (id: number) => `user:${id}`;
const sessionRoom = (sid: string) => `session:${sid}`;
/** How often sockets whose session may have expired are looked at. */
const EXPIRY_SWEEP_MS = 500;
/** How long an ended session is remembered, for handshakes that were under way when it ended. */
const ENDED_KEEP_MS = 60_000;

export function attachRealtime(ctx: AppContext, http: HttpServer, sessionMiddleware: RequestHandler): RealtimeServer {
  const ownOrigin = new URL(ctx.config.publicUrl).origin;
  const io: RealtimeServer = new Server(http, {
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
  const cluster = clusterOf(ctx);
  if (cluster.socketAdapter) io.adapter(cluster.socketAdapter.adapter);
  const watchedSets = cluster.watchedSets;

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

  const joinRooms = async (socket: RealtimeSocket, actor: SessionUser) => {
    for (const room of socket.rooms) if (room.startsWith('farm:') || room.startsWith('farms:')) await socket.leave(room);
    await socket.join([userRoom(actor.id), setRoom(actor), ...actor.farmIds.map(farmRoom)]);
  };

  const deltas = createDeltaBuilder(ctx);
  io.on('connection', (socket) => {
    const { actor, session } = socket.data;
    // The session may have ended while the handshake was being checked.
    if (endedSince(session)) return void socket.disconnect(true);
    void (async () => {
      await socket.join([sessionRoom(session.sid), userRoom(session.userId)]);
      await joinRooms(socket, actor);
      const setKey = farmSetKey(actor.organisationId, actor.farmIds);
      await Promise.all([deltas.watch(actor.organisationId, actor.farmIds), watchedSets?.add(actor.organisationId, [setKey])]);
      // Joined: every delta numbered after this reaches the socket.
      socket.emit('board:stream', await streamPosition(ctx, setKey));
    })().catch((err: unknown) => {
      ctx.logger.error({ err }, 'socket set-up failed');
      socket.disconnect(true);
    });
  });

  /** The farm sets of an organisation watched on this process (its socket rooms). */
  const localSetKeys = (organisationId: number) => {
    const prefix = setPrefix(organisationId);
    return [...io.of('/').adapter.rooms.keys()].filter((room) => room.startsWith(prefix)).map((room) => room.slice(SET_ROOM.length));
  };
  /** The changed farms of one organisation, as one delta per watched farm set (on any process) that shows some of them. */
  const pushFarms = async (organisationId: number, farmIds: Iterable<number>, since: number) => {
    const keys = new Set(localSetKeys(organisationId));
    // Without the list (Redis away) no delta can be numbered either: the build below refuses.
    if (watchedSets) for (const key of await watchedSets.list(organisationId)) keys.add(key);
    const prefix = `${organisationId}:`;
    const sets: WatchedSet[] = [...keys].map((key) => ({ key, farmIds: new Set(key.slice(prefix.length).split(',').map(Number)) }));
    for (const { key, delta } of await deltas.build(organisationId, farmIds, sets)) {
      // Encoded once by socket.io for the whole room.
      io.to(`${SET_ROOM}${key}`).emit('board:delta', delta);
      recordTiming(ctx, 'board-push', Date.now() - since);
    }
  };
  // While Redis is away every push fails the same way: once every 10 s in the log is enough. The
  // clients fetch the board once it returns (a new stream, board-sequences.ts).
  let pushFailedAt = 0;
  const pushFailed = (err: unknown) => {
    if (Date.now() - pushFailedAt < 10_000) return;
    pushFailedAt = Date.now();
    ctx.logger.warn({ err }, 'board push failed');
  };
  /** Per organisation: the changed farms and when the first of those changes was heard of. */
  const dirty = new Map<number, { farms: Set<number>; since: number }>();
  let timer: NodeJS.Timeout | null = null;
  let lastFlushAt = 0;
  let flushing = false;
  // One flush at a time: what changes while one runs is gathered into the next, so pushes never
  // queue up behind each other and a slower earlier board never overtakes a later one.
  const flush = async () => {
    timer = null;
    // The lease went to another process meanwhile: the changes wait here in case it comes back.
    if (!building()) return;
    flushing = true;
    lastFlushAt = Date.now();
    const batch = [...dirty.entries()];
    dirty.clear();
    for (const [organisationId, { farms, since }] of batch) {
      await pushFarms(organisationId, farms, since).catch((err: unknown) => {
        pushFailed(err);
        // Nothing of it went out (Redis away, the read failed): tried again a second
        // later with whatever changes meanwhile, so no change is left unsent without the clients seeing a gap.
        const pending = dirty.get(organisationId);
        if (pending) for (const id of farms) pending.farms.add(id);
        else dirty.set(organisationId, { farms, since });
        lastFlushAt = Date.now() + RETRY_MS - THROTTLE_MS;
      });
    }
    flushing = false;
    if (dirty.size) arm();
  };
  // Leading edge: a change after a quiet spell goes out at once; later ones within the window are gathered.
  const arm = () => {
    if (timer || flushing || !building()) return;
    timer = setTimeout(() => void flush(), Math.max(0, lastFlushAt + THROTTLE_MS - Date.now()));
  };
  const noteChange = ({ organisationId, farmIds }: BoardChange) => {
    let pending = dirty.get(organisationId);
    if (!pending) dirty.set(organisationId, (pending = { farms: new Set(), since: Date.now() }));
    for (const id of farmIds) pending.farms.add(id);
    arm();
  };
  const onBoardChange = (change: BoardChange) => {
    if (builderLease) cluster.bus.publish(CHANGED_TOPIC, { organisationId: change.organisationId, farmIds: [...change.farmIds] } satisfies BoardChange);
    noteChange(change);
  };
  // With several processes one builds every delta, the lease's holder; every process hears every
  // change (its own, and the others' on the bus), so the next holder starts from what is pending.
  const builderLease = cluster.redis
    ? redisLease(cluster.redis, 'board-builder', ctx.logger, {
        onGained: () => {
          // What it kept from an earlier turn may be older than what another holder sent since.
          deltas.forget();
          const now = Date.now();
          for (const pending of dirty.values()) pending.since = now;
          arm();
        },
      })
    : null;
  const building = () => builderLease === null || builderLease.held();
  const stopHearingChanges = builderLease ? cluster.bus.subscribe(CHANGED_TOPIC, (body) => noteChange(body as BoardChange)) : () => undefined;
  const onUserChanged = ({ userId }: { userId: number }) => {
    io.in(userRoom(userId)).disconnectSockets(true);
  };
  const onUserEvent = ({ userId, event, payload }: { userId: number; event: string; payload: unknown }) => {
    if (event !== 'import:progress') return void ctx.logger.warn({ event }, 'unknown user event not sent');
    io.to(userRoom(userId)).emit(event, payload as ServerEventPayload<typeof event>);
  };
  const onFlags = async ({ organisationId, farmIds }: { organisationId: number; farmIds: number[] }) => {
    for (const farmId of farmIds) {
      const flags = await activeFlagsOf(ctx, organisationId, farmId).catch((err) => (ctx.logger.error({ err }, 'flag push failed'), null));
      if (flags) io.to(farmRoom(farmId)).emit('flags:farm', { farmId, flags });
    }
  };
  ctx.events.on('flags', onFlags);
  const stopReadings = onEvent(ctx, 'readings', onBoardChange);
  // Newer cached use rates (computed off the request path) change days of cover: push those farms too.
  const stopForecasts = onEvent(ctx, 'forecasts', onBoardChange);
  const stopTimings = answerTimingRequests(ctx);
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
    const idle: { socket: RealtimeSocket; session: SocketSession }[] = [];
    for (const socket of io.of('/').sockets.values()) {
      const session = socket.data.session;
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
  // The sets this process's sockets watch stay listed for the other processes while the sockets stay,
  // and are listed again at once when Redis comes back (a restarted Redis has forgotten them).
  const renew = () => {
    const byOrg = new Map<number, string[]>();
    for (const room of io.of('/').adapter.rooms.keys()) {
      if (!room.startsWith(SET_ROOM)) continue;
      const key = room.slice(SET_ROOM.length);
      const org = Number(key.slice(0, key.indexOf(':')));
      byOrg.set(org, [...(byOrg.get(org) ?? []), key]);
    }
    for (const [org, keys] of byOrg) void watchedSets?.add(org, keys);
  };
  const renewer = watchedSets ? setInterval(renew, WATCH_RENEW_MS) : null;
  renewer?.unref();
  cluster.redis?.on('ready', renew);

  // io.close() ends with closing the HTTP server.
  http.once('close', () => {
    ctx.events.off('flags', onFlags);
    stopReadings();
    stopForecasts();
    stopTimings();
    ctx.events.off('user-changed', onUserChanged);
    ctx.events.off('user-event', onUserEvent);
    stopSessionEnded();
    clearInterval(sweeper);
    if (renewer) clearInterval(renewer);
    cluster.redis?.off('ready', renew);
    stopHearingChanges();
    void builderLease?.close();
    if (timer) clearTimeout(timer);
  });
  return io;
}
