// socket.io: the handshake is authenticated with the API's own session; the server (never the
// client) puts each socket in the rooms of the farms its user may see, and pushes a farm's
// board to its room at most every THROTTLE_MS however many readings commit meanwhile.
import type { Server as HttpServer } from 'node:http';
import type { RequestHandler } from 'express';
import { Server } from 'socket.io';
import type { SessionUser } from '@shared/schemas';
import type { AppContext } from './context';
import { boardOf, stockBoard } from './services/board';
import { activeFlagsOf } from './services/flags';
import { keptSessionUser } from './services/kept-identity';

export const THROTTLE_MS = 250;
const farmRoom = (id: number) => `farm:${id}`;
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
    for (const room of socket.rooms) if (room.startsWith('farm:')) await socket.leave(room);
    await socket.join([userRoom(actor.id), ...actor.farmIds.map(farmRoom)]);
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

  const pending = new Map<number, { organisationId: number; timer: NodeJS.Timeout | null; dirty: boolean }>();
  const pushFarm = async (organisationId: number, farmId: number) => {
    const board = await boardOf(ctx, organisationId, [farmId]);
    const farm = board.farms[0] ?? { farmId, name: '', totals: [], tanks: [] };
    io.to(farmRoom(farmId)).emit('board:farm', farm);
  };
  const schedule = (organisationId: number, farmId: number) => {
    const slot = pending.get(farmId);
    if (slot?.timer) {
      slot.dirty = true;
      return;
    }
    const entry = { organisationId, dirty: false, timer: null as NodeJS.Timeout | null };
    pending.set(farmId, entry);
    const fire = () => {
      if (!entry.dirty) {
        pending.delete(farmId);
        return;
      }
      entry.dirty = false;
      void pushFarm(organisationId, farmId).catch((err) => ctx.logger.error({ err }, 'board push failed'));
      entry.timer = setTimeout(fire, THROTTLE_MS);
    };
    // Leading edge: the first change goes out at once; later ones within the window are folded.
    void pushFarm(organisationId, farmId).catch((err) => ctx.logger.error({ err }, 'board push failed'));
    entry.timer = setTimeout(fire, THROTTLE_MS);
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
    for (const p of pending.values()) if (p.timer) clearTimeout(p.timer);
  });
  return io;
}
