/**
 * Sessions stay in PostgreSQL (connect-pg-simple), but an active session's expiry is written at most once per
 * `touchAfterMs` by each instance instead of on every request. express-session (with `rolling`) asks the store to
 * touch every session it reads; this store lets the touch through only when this instance has not written that
 * session's expiry for `touchAfterMs`. A session therefore lives at least its full age minus `touchAfterMs` after the
 * user's last request (the cookie itself still rolls with each answer).
 */
import connectPgSimple from 'connect-pg-simple';
import session from 'express-session';
import type pg from 'pg';

const PgStore = connectPgSimple(session);

/** How many session ids an instance remembers the last write of (the oldest is forgotten first). */
const REMEMBERED = 20_000;

export interface ThrottledStoreOptions {
  pool: pg.Pool;
  touchAfterMs: number;
  pruneSessionInterval?: number;
}

export class ThrottledPgStore extends PgStore {
  private readonly written = new Map<string, number>();
  private readonly touchAfterMs: number;

  constructor({ pool, touchAfterMs, pruneSessionInterval }: ThrottledStoreOptions) {
    super({ pool, tableName: 'session', createTableIfMissing: false, pruneSessionInterval });
    this.touchAfterMs = touchAfterMs;
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
      fn?.(err);
    });
  }

  override set(sid: string, sess: session.SessionData, fn?: (err?: unknown) => void): void {
    this.remember(sid);
    super.set(sid, sess, (err?: unknown) => {
      if (err) this.written.delete(sid);
      fn?.(err);
    });
  }

  override destroy(sid: string, fn?: (err?: unknown) => void): void {
    this.written.delete(sid);
    super.destroy(sid, fn);
  }
}
