// Who is signed in, kept in memory for a few seconds. Every API request and socket needs its
// session row and its user with organisation and farms: four queries, which cost a busy board or
// round more than its own work. A kept session is dropped when any session row is written, a kept
// user when any user, organisation, farm or farm-access row is written (through Sequelize, on
// this database, and again when that write's transaction commits); nothing is kept longer than
// KEEP_MS, so a change made outside the server applies within seconds too. With several server
// processes every drop is also sent on the bus (topic 'signed-in'), and each other process drops
// its own copy when it hears it.
import type { Store, SessionData } from 'express-session';
import { LRUCache } from 'lru-cache';
import type { ModelStatic, Sequelize, Transaction } from 'sequelize';
import type { SessionUser } from '@shared/schemas';
import { clusterOf } from '../cluster';
import type { AppContext } from '../context';
import { sessionUserFor } from './auth';

export const KEEP_MS = 5_000;

/** The bus topic of the drops, and what its messages say: everything of one kind, or one session. */
export const SIGNED_IN_TOPIC = 'signed-in';
type SignedInDrop = { kind: 'users' } | { kind: 'sessions' } | { kind: 'session'; sid: string };

/** One kind of kept row: entries and a generation that every write of its tables moves on. */
class Kept<K extends string | number, V extends object> {
  generation = 0;
  readonly entries = new LRUCache<K, V>({ max: 20_000, ttl: KEEP_MS });

  drop(): void {
    this.generation++;
    this.entries.clear();
  }

  /** The kept value, else `load`'s, kept unless a write happened while it loaded. */
  async get(key: K, load: () => Promise<V | null>): Promise<V | null> {
    const hit = this.entries.get(key);
    if (hit) return hit;
    const generation = this.generation;
    const value = await load();
    if (value && generation === this.generation) this.entries.set(key, value);
    return value;
  }
}

interface SignedInCache {
  users: Kept<number, SessionUser>;
  sessions: Kept<string, { text: string }>;
}

const byDatabase = new WeakMap<Sequelize, SignedInCache>();

type WriteOptions = { model?: ModelStatic<never>; transaction?: Transaction | null };
const INSTANCE_HOOKS = ['afterCreate', 'afterUpdate', 'afterDestroy', 'afterSave', 'afterUpsert'] as const;
const BULK_HOOKS = ['afterBulkCreate', 'afterBulkUpdate', 'afterBulkDestroy'] as const;

function keptFor(ctx: AppContext): SignedInCache {
  const sequelize = ctx.db.sequelize;
  const kept = byDatabase.get(sequelize);
  if (kept) return kept;
  const made: SignedInCache = { users: new Kept(), sessions: new Kept() };
  const { bus } = clusterOf(ctx);
  bus.subscribe(SIGNED_IN_TOPIC, (body) => {
    const drop = body as SignedInDrop;
    if (drop.kind === 'users') made.users.drop();
    else if (drop.kind === 'sessions') made.sessions.drop();
    else if (drop.kind === 'session' && typeof drop.sid === 'string') made.sessions.entries.delete(drop.sid);
  });
  const { User, Organisation, Farm, FarmAccess, Session } = ctx.db.models;
  const identity = new Set<unknown>([User, Organisation, Farm, FarmAccess]);
  const dropFor = (model: unknown, options: WriteOptions | undefined) => {
    const target = model === Session ? made.sessions : identity.has(model) ? made.users : null;
    if (!target) return;
    const drop: SignedInDrop = { kind: target === made.sessions ? 'sessions' : 'users' };
    const dropEverywhere = () => {
      target.drop();
      bus.publish(SIGNED_IN_TOPIC, drop);
    };
    dropEverywhere();
    // A read between this write and its commit still sees the old row (here or on another process): drop again once it commits.
    options?.transaction?.afterCommit(dropEverywhere);
  };
  for (const hook of INSTANCE_HOOKS) {
    sequelize.addHook(hook, function (this: unknown, _instance: unknown, options: WriteOptions) {
      dropFor(this, options);
    });
  }
  for (const hook of BULK_HOOKS) {
    sequelize.addHook(hook, function (this: unknown, first: unknown, second?: WriteOptions) {
      // Bulk create passes (instances, options); bulk update and destroy pass (options).
      const options = (hook === 'afterBulkCreate' ? second : first) as WriteOptions | undefined;
      dropFor(options?.model ?? this, options);
    });
  }
  byDatabase.set(sequelize, made);
  return made;
}

/** The signed-in user as `sessionUserFor` gives it, from memory when nothing that shapes it was written since. */
export async function keptSessionUser(ctx: AppContext, userId: number): Promise<SessionUser | null> {
  const user = await keptFor(ctx).users.get(userId, () => sessionUserFor(ctx, userId));
  return user && { ...user, farmIds: [...user.farmIds] };
}

/** Puts a short-lived memory in front of a session store's reads; its writes go through and drop it. */
export function keepSessionReads(ctx: AppContext, store: Store): void {
  const kept = keptFor(ctx).sessions;
  const { bus } = clusterOf(ctx);
  const forget = (sid: string) => {
    kept.entries.delete(sid);
    bus.publish(SIGNED_IN_TOPIC, { kind: 'session', sid } satisfies SignedInDrop);
  };
  const read = store.get.bind(store);
  const load = (sid: string) =>
    new Promise<{ text: string } | null>((resolve, reject) => {
      read(sid, (err: unknown, data?: SessionData | null) => (err ? reject(err) : resolve(data ? { text: JSON.stringify(data) } : null)));
    });
  store.get = (sid, done) => {
    kept.get(sid, () => load(sid)).then(
      (hit) => done(null, hit ? (JSON.parse(hit.text) as SessionData) : null),
      (err: unknown) => done(err),
    );
  };
  const write = store.set.bind(store);
  store.set = (sid, data, done) => {
    kept.entries.delete(sid);
    write(sid, data, (err?: unknown) => {
      forget(sid);
      done?.(err);
    });
  };
  const destroy = store.destroy.bind(store);
  store.destroy = (sid, done) => {
    kept.entries.delete(sid);
    destroy(sid, (err?: unknown) => {
      forget(sid);
      done?.(err);
    });
  };
}
