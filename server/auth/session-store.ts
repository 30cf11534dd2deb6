/**
 * Sessions stay in PostgreSQL (connect-pg-simple), but an active session's expiry is written at most once per
 * `touchAfterMs` by each instance instead of on every request. express-session (with `rolling`) asks the store to
 * touch every session it reads; this store lets the touch through only when this instance has not written that
 * session's expiry for `touchAfterMs`. A session therefore lives at least its full age minus `touchAfterMs` after the
 * user's last request (the cookie itself still rolls with each answer).
 *
 * Given the instance's SharedCaches, a session read is also answered from memory: the stored text and its expiry
 * are kept per instance and dropped on every instance when the session's data changes or it is deleted or its
 * expiry brought forward (whoever does it: this app, another instance, plain SQL), through the triggers of migration
 * `2026.12.09T00.00` and the caches' LISTEN connection. The key is the SHA-256 of the id, so that an id is never
 * broadcast. While the listener is down, every read goes to the database as before.
 */
import { createHash } from 'node:crypto';
import connectPgSimple from 'connect-pg-simple';
import session from 'express-session';
import type pg from 'pg';
import type { CachedSession, SharedCaches } from '../services/shared-caches';

const PgStore = connectPgSimple(session);

/** How many session ids an instance remembers the last write of (the oldest is forgotten first). */
const REMEMBERED = 20_000;

export interface ThrottledStoreOptions {
  pool: pg.Pool;
  touchAfterMs: number;
  pruneSessionInterval?: number;
  caches?: SharedCaches;
}

/** A session's key in the caches and in the database's notifications (the trigger computes the same). */
export function sessionKey(sid: string): string {
  return createHash('sha256').update(sid, 'utf8').digest('hex');
}

export class ThrottledPgStore extends PgStore {
  private readonly written = new Map<string, number>();
  private readonly touchAfterMs: number;
  private readonly pool: pg.Pool;
  private readonly caches: SharedCaches | undefined;

  constructor({ pool, touchAfterMs, pruneSessionInterval, caches }: ThrottledStoreOptions) {
    super({ pool, tableName: 'session', createTableIfMissing: false, pruneSessionInterval });
    this.touchAfterMs = touchAfterMs;
    this.pool = pool;
    this.caches = caches;
  }

  /** The stored session as text with its expiry, if it has not expired (connect-pg-simple's test of the expiry). */
  private async readStored(sid: string): Promise<CachedSession | null> {
    const { rows } = await this.pool.query<{ sess: string; expire: Date }>(
      'SELECT sess::text AS sess, expire FROM session WHERE sid = $1 AND to_timestamp($2) < expire',
      [sid, Date.now() / 1000],
    );
    const row = rows[0];
    return row ? { json: row.sess, expires: row.expire.getTime() } : null;
  }

  override get(sid: string, fn: (err: unknown, session?: session.SessionData | null) => void): void {
    if (!this.caches) return super.get(sid, fn);
    this.caches.session(sessionKey(sid), () => this.readStored(sid)).then(
      (entry) => fn(null, entry ? (JSON.parse(entry.json) as session.SessionData) : null),
      (err: unknown) => fn(err),
    );
  }

  /** Drops this instance's copy now (the database's notification reaches the others, and this one again). */
  private forget(sid: string): void {
    this.caches?.apply({ kind: 'session', key: sessionKey(sid) });
  }

  private remember(sid: string): void {
    this.written.delete(sid);
    this.written.set(sid, Date.now());
    if (this.written.size > REMEMBERED) this.written.delete(this.written.keys().next().value!);
  }

  override touch(sid: string, sess: session.SessionData, fn?: (err?: unknown) => void): void {
    const last = this.written.get(sid);
    if (last !== undefined && Date.now() - last < this.touchAfterMs) {
      fn?.();
      return;
    }
    this.remember(sid);
    super.touch(sid, sess, (err?: unknown) => {
      if (err) this.written.delete(sid);
      else if (sess.cookie?.expires) this.caches?.sessionExpiryMoved(sessionKey(sid), Math.ceil(new Date(sess.cookie.expires).getTime() / 1000) * 1000);
      fn?.(err);
    });
  }

  override set(sid: string, sess: session.SessionData, fn?: (err?: unknown) => void): void {
    this.remember(sid);
    // Dropped before the write and again after it, so that no read that raced the write keeps what it read.
    this.forget(sid);
    super.set(sid, sess, (err?: unknown) => {
      if (err) this.written.delete(sid);
      this.forget(sid);
      fn?.(err);
    });
  }

  override destroy(sid: string, fn?: (err?: unknown) => void): void {
    this.written.delete(sid);
    this.forget(sid);
    super.destroy(sid, (err?: unknown) => {
      this.forget(sid);
      fn?.(err);
    });
  }
}
