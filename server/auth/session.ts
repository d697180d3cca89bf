import connectPgSimple from "connect-pg-simple";
import type { RequestHandler } from "express";
import session from "express-session";
import type { Logger } from "pino";
import type pg from "pg";
import type { DataSource, EntityManager } from "typeorm";

export const SESSION_COOKIE = "runwright.sid";
/** Created by the create-accounts migration, never at run time. */
export const SESSION_TABLE = "user_session";
const TWO_WEEKS_MS = 14 * 24 * 60 * 60 * 1000;

export interface SessionSettings {
  secret: string;
  /** `auto` sets Secure when the request arrived over HTTPS. */
  cookieSecure: "auto" | "true" | "false";
  /** Delete expired sessions every 15 minutes (the running server does; tests need not). */
  pruneExpired?: boolean;
  logger: Logger;
}

/** The pg pool under TypeORM's DataSource, shared with the session store. */
export function poolOf(db: DataSource): pg.Pool {
  const pool = (db.driver as unknown as { master?: pg.Pool }).master;
  if (!pool) throw new Error("The DataSource is not initialized: no pool to keep sessions in");
  return pool;
}

/**
 * How often a signed-in person's session expiry is moved on in the database. express-session
 * "touches" the store after every request that did not change the session, and connect-pg-simple
 * answers each touch with an UPDATE and a commit: about one query in five of a busy server
 * (npm run bench:load measured 5.5 queries per response, 4.3 without touches). Touching at most
 * every 10 minutes per session and process keeps the two-week sliding expiry to within minutes.
 */
const TOUCH_EVERY_MS = 10 * 60 * 1000;
/** Sessions remembered per process before the memory of touches starts over. */
const TOUCH_MEMORY = 50_000;

/** express-session with its rows in PostgreSQL (connect-pg-simple). */
export function sessionMiddleware(db: DataSource, settings: SessionSettings): RequestHandler {
  const PgStore = connectPgSimple(session);
  const touched = new Map<string, number>();
  class ThrottledTouchStore extends PgStore {
    override touch(sid: string, sess: session.SessionData, callback?: (err?: unknown) => void): void {
      const now = Date.now();
      const last = touched.get(sid);
      if (last !== undefined && now - last < TOUCH_EVERY_MS) return callback?.();
      if (touched.size >= TOUCH_MEMORY) touched.clear();
      touched.set(sid, now);
      super.touch(sid, sess, callback);
    }
  }
  const store = new ThrottledTouchStore({
    // Looked up on every query: the pool exists only once the DataSource is initialized, and a new one after a reconnect.
    pool: { query: (text: string, params?: unknown[]) => poolOf(db).query(text, params) } as unknown as pg.Pool,
    tableName: SESSION_TABLE,
    createTableIfMissing: false,
    pruneSessionInterval: settings.pruneExpired ? 15 * 60 : false,
    errorLog: (...args: unknown[]) => settings.logger.error({ args }, "session store error"),
  });
  return session({
    name: SESSION_COOKIE,
    secret: settings.secret,
    store,
    resave: false,
    saveUninitialized: false,
    cookie: {
      httpOnly: true,
      sameSite: "lax",
      secure: settings.cookieSecure === "auto" ? "auto" : settings.cookieSecure === "true",
      maxAge: TWO_WEEKS_MS,
      path: "/",
    },
  });
}

/** Ends every session of a user except the one with id `keepSid` (after a password reset), inside the caller's transaction. */
export async function endOtherSessions(tx: EntityManager, userId: string, keepSid?: string): Promise<void> {
  await tx.query(`DELETE FROM "${SESSION_TABLE}" WHERE "sess" -> 'passport' ->> 'user' = $1 AND "sid" <> $2`, [userId, keepSid ?? ""]);
}
