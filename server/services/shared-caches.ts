/**
 * What each server instance keeps in memory so that a request does not start with database round trips: the
 * signed-in users and the built catalog. Both are dropped the moment the database says they changed, on every
 * instance: triggers on the users and price-list tables send a PostgreSQL NOTIFY on the channel below when a
 * change commits (whoever makes it: this app, another instance, the `user:add` command or plain SQL), and each
 * instance LISTENs on its own connection through pg-listen.
 *
 * The caches are trusted only while the listener is connected. While it is down or reconnecting, every lookup goes
 * to the database as before; when it connects again, everything cached is dropped, since notifications sent in
 * between were missed. A generation counter stops a read that started before an invalidation from storing what it
 * read after it.
 */
import { EventEmitter, once } from 'node:events';
import type { RequestHandler } from 'express';
import createPostgresSubscriber, { type Subscriber } from 'pg-listen';

/** The channel the migrations' triggers notify; payloads are `user:<id>`, `catalog` and `session:<key>`. */
export const CACHE_CHANNEL = 'shellwright_cache';

export interface CachedUser {
  id: number;
  email: string;
  name: string;
  role: Express.User['role'];
  workshopId: number;
}

/** A user as the session sees them: active (the fields a request needs) or gone (unknown or deactivated). */
export type UserEntry = CachedUser | false;

/** What changed, as received from the database (or dropped locally). */
export type Invalidation = { kind: 'user'; id: number } | { kind: 'catalog' } | { kind: 'session'; key: string } | { kind: 'all' };

/**
 * A stored session as an instance keeps it: the stored text (parsed afresh for each request, which changes its copy)
 * and the expiry the database holds for it, in ms.
 */
export interface CachedSession {
  json: string;
  expires: number;
}

const MAX_USERS = 5_000;
const MAX_SESSIONS = 20_000;

export class SharedCaches {
  private readonly users = new Map<number, UserEntry>();
  private readonly catalogs = new Map<string, unknown>();
  private readonly sessions = new Map<string, CachedSession>();
  private generation = 0;
  private connected = false;
  private closed = false;
  private subscriber: Subscriber | undefined;
  private barrierSeq = 0;
  private readonly instance = `${process.pid}-${Math.random().toString(36).slice(2, 10)}`;
  /** Emits `invalidated` (an Invalidation) after each one is applied, and `barrier:<n>` for settle(). */
  readonly events = new EventEmitter();
  /** Resolves once the listener is connected the first time (or rejects if it never could). */
  readonly ready: Promise<void>;

  constructor(databaseUrl: string) {
    this.events.setMaxListeners(0);
    this.subscriber = createPostgresSubscriber(
      { connectionString: databaseUrl },
      // Keep trying for ever (retryTimeout 0), backing off to 5 s; check the connection every 10 s, so that a link
      // that died silently is noticed (and the caches bypassed) within that time.
      { paranoidChecking: 10_000, retryLimit: Infinity, retryTimeout: 0, retryInterval: (n) => Math.min(5_000, 250 * 2 ** n), parse: (s) => s, serialize: (s) => String(s) },
    );
    this.subscriber.events.on('error', () => {
      // pg-listen reports a failed reconnection here; it keeps trying, and the caches stay bypassed meanwhile.
      this.setConnected(false);
    });
    this.subscriber.events.on('reconnect', () => this.setConnected(false));
    this.subscriber.events.on('connected', () => this.setConnected(true));
    this.subscriber.events.on('notification', ({ channel, payload }) => {
      if (channel === CACHE_CHANNEL) this.onMessage(String(payload ?? ''));
    });
    this.ready = (async () => {
      await this.subscriber!.connect();
      await this.subscriber!.listenTo(CACHE_CHANNEL);
      this.setConnected(true);
    })();
    // A database that is down at start is not fatal: lookups go to the database until the listener gets through.
    this.ready.catch(() => undefined);
  }

  /** True while notifications are being received, so that what is cached can be trusted. */
  get live(): boolean {
    return this.connected && !this.closed;
  }

  private setConnected(value: boolean): void {
    if (value === this.connected) return;
    // Either way, what is cached may have changed unseen: drop it.
    this.connected = value;
    this.apply({ kind: 'all' });
  }

  private onMessage(payload: string): void {
    if (payload.startsWith('barrier:')) {
      this.events.emit(payload);
      return;
    }
    if (payload === 'catalog') return this.apply({ kind: 'catalog' });
    const m = /^user:(\d+)$/.exec(payload);
    if (m) return this.apply({ kind: 'user', id: Number(m[1]) });
    const sm = /^session:([0-9a-f]{64})$/.exec(payload);
    if (sm) return this.apply({ kind: 'session', key: sm[1]! });
    this.apply({ kind: 'all' });
  }

  /** Drops what changed and tells anyone waiting. Also called locally right after this instance's own writes. */
  apply(change: Invalidation): void {
    this.generation++;
    if (change.kind === 'user') this.users.delete(change.id);
    if (change.kind === 'catalog' || change.kind === 'all') this.catalogs.clear();
    if (change.kind === 'session') this.sessions.delete(change.key);
    if (change.kind === 'all') {
      this.users.clear();
      this.sessions.clear();
    }
    this.events.emit('invalidated', change);
  }

  /**
   * A signed-in user, from memory when the listener is live, else from `load` (which returns false for an unknown
   * or deactivated user).
   */
  async user(id: number, load: (id: number) => Promise<UserEntry>): Promise<UserEntry> {
    if (!this.live) return load(id);
    const hit = this.users.get(id);
    if (hit !== undefined) return hit;
    const generation = this.generation;
    const entry = await load(id);
    if (generation === this.generation && this.live) {
      if (this.users.size >= MAX_USERS) this.users.delete(this.users.keys().next().value!);
      this.users.set(id, entry);
    }
    return entry;
  }

  /**
   * A stored session by its key (see sessionKey), from memory when the listener is live and the expiry it was
   * stored with has not passed, else from `load` (null for none, or one expired).
   */
  async session(key: string, load: () => Promise<CachedSession | null>): Promise<CachedSession | null> {
    if (!this.live) return load();
    const hit = this.sessions.get(key);
    if (hit !== undefined) {
      if (hit.expires > Date.now()) return hit;
      this.sessions.delete(key);
    }
    const generation = this.generation;
    const entry = await load();
    if (entry && generation === this.generation && this.live) {
      if (this.sessions.size >= MAX_SESSIONS) this.sessions.delete(this.sessions.keys().next().value!);
      this.sessions.set(key, entry);
    }
    return entry;
  }

  /** This instance wrote a later expiry for a session it holds (the database sends nothing for a later expiry). */
  sessionExpiryMoved(key: string, expires: number): void {
    const hit = this.sessions.get(key);
    if (hit && expires > hit.expires) hit.expires = expires;
  }

  /** A value built from the price list (one per key, e.g. per date), from memory when the listener is live. */
  async catalog<T>(key: string, build: () => Promise<T>): Promise<T> {
    if (!this.live) return build();
    const hit = this.catalogs.get(key);
    if (hit !== undefined) return hit as T;
    const generation = this.generation;
    const value = await build();
    if (generation === this.generation && this.live) {
      if (this.catalogs.size >= 64) this.catalogs.delete(this.catalogs.keys().next().value!);
      this.catalogs.set(key, value);
    }
    return value;
  }

  /**
   * Resolves once every notification for changes committed before the call has been applied here: sends a marker
   * through PostgreSQL and waits for it to come back (the database delivers notifications in commit order).
   */
  async settle(): Promise<void> {
    await this.ready;
    const marker = `barrier:${this.instance}:${++this.barrierSeq}`;
    const back = once(this.events, marker);
    await this.subscriber!.notify(CACHE_CHANNEL, marker);
    await back;
  }

  async close(): Promise<void> {
    if (this.closed) return;
    this.closed = true;
    this.apply({ kind: 'all' });
    await this.ready.catch(() => undefined);
    await this.subscriber?.close().catch(() => undefined);
    this.subscriber = undefined;
  }
}

/** The caches of the app serving this request (each app built by createApp has its own). */
export function cachesOf(req: { app?: { locals: Record<string, unknown> } }): SharedCaches | undefined {
  return req.app?.locals.caches as SharedCaches | undefined;
}

/** API paths whose writes change the price list (and so the catalog), and the users. */
const CATALOG_WRITES = /^\/api\/(price-list|settings|labour-rates|finishing-systems|species|workshop|purchase-orders)(\/|$)/;
const USER_WRITES = /^\/api\/users(\/|$)/;

/**
 * Drops this instance's cached catalog or users when it answers a write to them, before the answer leaves, so the
 * writer's next request sees the change without waiting for the database's notification (which still comes, and
 * is what other instances act on).
 */
export function invalidateAfterWrites(caches: SharedCaches): RequestHandler {
  return (req, res, next) => {
    if (req.method === 'GET' || req.method === 'HEAD' || req.method === 'OPTIONS') return next();
    const change: Invalidation | undefined = CATALOG_WRITES.test(req.path) ? { kind: 'catalog' } : USER_WRITES.test(req.path) ? { kind: 'all' } : undefined;
    if (!change) return next();
    const writeHead = res.writeHead;
    res.writeHead = function (this: typeof res, ...args: Parameters<typeof writeHead>) {
      caches.apply(change);
      return writeHead.apply(this, args);
    } as typeof writeHead;
    next();
  };
}
