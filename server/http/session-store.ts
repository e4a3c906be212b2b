/**
 * Sessions live in PostgreSQL (connect-pg-simple), so every web process sees the same ones. The
 * idle timeout is the stored expiry, pushed forward ("touched") by requests; a busy drive sends
 * several requests a second, so a process writes a session's touch at most once a minute. The
 * idle limit is therefore kept to within a minute, and a step batch costs no session write.
 */
import connectPgSimple from 'connect-pg-simple';
import session from 'express-session';

const PgSessionStore = connectPgSimple(session);

export const TOUCH_INTERVAL_MS = 60_000;
/** Sessions remembered as recently touched, per process; the memory is dropped past this. */
const MAX_REMEMBERED = 100_000;

export function createSessionStore(databaseUrl: string, options: { prune: boolean }): session.Store {
  const store = new PgSessionStore({
    conString: databaseUrl, // the store owns this pool and ends it on close()
    tableName: 'session',
    createTableIfMissing: false,
    pruneSessionInterval: options.prune ? 15 * 60 : false,
  });
  const touchedAt = new Map<string, number>();
  const touch = store.touch.bind(store);
  store.touch = (sid, sess, callback) => {
    const now = Date.now();
    const last = touchedAt.get(sid);
    if (last !== undefined && now - last < TOUCH_INTERVAL_MS) return callback?.();
    if (touchedAt.size >= MAX_REMEMBERED) touchedAt.clear();
    touchedAt.set(sid, now);
    touch(sid, sess, callback);
  };
  return store;
}
