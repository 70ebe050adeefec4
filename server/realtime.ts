// socket.io: the handshake is authenticated with the API's own session; the server (never the
// client) puts each socket in the rooms of the farms its user may see and in the room of that
// set of farms. Farms whose readings commit are gathered and pushed at most every THROTTLE_MS,
// in one message per farm set holding every changed farm of the set, however many commit meanwhile.
import type { Server as HttpServer } from 'node:http';
import type { RequestHandler } from 'express';
import { Server } from 'socket.io';
import type { SessionUser } from '@shared/schemas';
import type { AppContext } from './context';
import { boardOf, stockBoard } from './services/board';
import { activeFlagsOf } from './services/flags';
import { keptSessionUser } from './services/kept-identity';

export const THROTTLE_MS = 100;
const farmRoom = (id: number) => `farm:${id}`;
const setPrefix = (organisationId: number) => `farms:${organisationId}:`;
const setRoom = (actor: SessionUser) => `${setPrefix(actor.organisationId)}${[...actor.farmIds].sort((a, b) => a - b).join(',')}`;
const userRoom = (id: number) => `user:${id}`;

export function attachRealtime(ctx: AppContext, http: HttpServer, sessionMiddleware: RequestHandler): Server {
  const io = new Server(http, { serveClient: false, path: '/socket.io' });
  io.engine.use(sessionMiddleware);

  io.use(async (socket, next) => {
    const session = (socket.request as unknown as { session?: { userId?: number; signedInAt?: number } }).session;
    const fresh = session?.signedInAt && Date.now() - session.signedInAt <= ctx.config.session.absoluteMs;
    let actor: SessionUser | null;
    try {
      actor = session?.userId && fresh ? await keptSessionUser(ctx, session.userId) : null;
    } catch (err) {
      ctx.logger.error({ err }, 'socket sign-in check failed');
      return next(new Error('unavailable'));
    }
    if (!actor) return next(new Error('unauthenticated'));
    socket.data.actor = actor;
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
  io.on('close', () => {
    ctx.events.off('flags', onFlags);
    ctx.events.off('readings', onReadings);
    ctx.events.off('forecasts', onReadings);
    ctx.events.off('user-changed', onUserChanged);
    ctx.events.off('user-event', onUserEvent);
    if (timer) clearTimeout(timer);
  });
  return io;
}
