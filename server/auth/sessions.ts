/**
 * Sessions. ALL use of lucia lives in this module so it can be replaced without touching routes.
 *
 * - Session id: 25 random bytes (lucia), kept in the HttpOnly cookie `bw_session`.
 * - Idle expiry (sliding): IDLE_DAYS after the last use; lucia extends it when half of it has passed.
 * - Absolute expiry: ABSOLUTE_DAYS after the session was created, however active it is.
 * - A new session on every sign-in; sign-out deletes the row, so a copied cookie stops working too.
 * - Sessions are listed to their user under a public id (a hash of the session id), never the id itself.
 * - On embedded PGlite (one process owns the data) a validated session is remembered for
 *   SESSION_CACHE_MS, so a burst of requests costs one database lookup, not one each. Everything that
 *   ends a session or changes its user goes through this module and forgets the entries at once
 *   (docs/decisions/009).
 * - On a PostgreSQL server (DATABASE_URL) other app servers may end a session this process has seen,
 *   so nothing is cached: every request validates against the database, and a sign-out on one server
 *   ends the session on all of them at once (docs/decisions/013, with the measured cost).
 */
import { DrizzlePostgreSQLAdapter } from '@lucia-auth/adapter-drizzle';
import { Lucia, TimeSpan, generateIdFromEntropySize, type Session } from 'lucia';
import { and, eq, ne } from 'drizzle-orm';
import type { Db } from '../db/client';
import { sessions, users } from '../db/schema';
import { sha256Hex } from '../ids';
import { isSharedDatabase } from './shared-store';

export const SESSION_COOKIE = 'bw_session';
export const IDLE_DAYS = 7;
export const ABSOLUTE_DAYS = 30;
const DAY_MS = 24 * 60 * 60 * 1000;
/** How long a validated session is reused without asking the database. */
export const SESSION_CACHE_MS = 2000;
const SESSION_CACHE_MAX = 10_000;

export interface SessionUser {
  id: string;
  email: string;
  name: string;
  createdAt: Date;
}

export interface ActiveSession {
  id: string;
  userId: string;
  createdAt: Date;
  /** When the session ends if unused: min(idle expiry, absolute expiry). */
  expiresAt: Date;
  userAgent: string;
  /** True when validation extended the idle expiry: the cookie should be sent again. */
  refreshed: boolean;
}

export interface CookieSpec {
  name: string;
  value: string;
  options: { httpOnly: true; sameSite: 'lax'; secure: boolean; path: '/'; expires: Date };
}

export interface PublicSession {
  id: string;
  createdAt: Date;
  expiresAt: Date;
  userAgent: string;
  current: boolean;
}

export type Sessions = ReturnType<typeof createSessions>;

function effectiveExpiry(createdAt: Date, idleExpiresAt: Date): Date {
  const absolute = createdAt.getTime() + ABSOLUTE_DAYS * DAY_MS;
  return new Date(Math.min(absolute, idleExpiresAt.getTime()));
}

/** The id shown to the user for one of their sessions (the real id is a bearer secret). */
export function publicSessionId(sessionId: string): string {
  return sha256Hex(`session:${sessionId}`).slice(0, 20);
}

function makeLucia(db: Db) {
  const adapter = new DrizzlePostgreSQLAdapter(db as never, sessions, users);
  return new Lucia(adapter, {
    sessionExpiresIn: new TimeSpan(IDLE_DAYS, 'd'),
    sessionCookie: { name: SESSION_COOKIE },
    getSessionAttributes: (a) => ({ createdAt: a.createdAt, userAgent: a.userAgent }),
    getUserAttributes: (a) => ({ email: a.email, name: a.name, createdAt: a.createdAt }),
  });
}

declare module 'lucia' {
  interface Register {
    Lucia: ReturnType<typeof makeLucia>;
    DatabaseSessionAttributes: { createdAt: Date; userAgent: string };
    DatabaseUserAttributes: { email: string; name: string; createdAt: Date };
  }
}

export function createSessions(db: Db, options: { cacheMs?: number } = {}) {
  const lucia = makeLucia(db);
  const cacheMs = options.cacheMs ?? (isSharedDatabase(db) ? 0 : SESSION_CACHE_MS);
  const cache = new Map<string, { at: number; value: { session: ActiveSession; user: SessionUser } }>();
  const forgetUser = (userId: string) => {
    for (const [id, e] of cache) if (e.value.user.id === userId) cache.delete(id);
  };

  function toActive(s: Session): ActiveSession {
    return {
      id: s.id,
      userId: s.userId,
      createdAt: s.createdAt,
      expiresAt: effectiveExpiry(s.createdAt, s.expiresAt),
      userAgent: s.userAgent ?? '',
      refreshed: s.fresh,
    };
  }

  return {
    async createSession(userId: string, userAgent = ''): Promise<ActiveSession> {
      const s = await lucia.createSession(userId, { createdAt: new Date(), userAgent: userAgent.slice(0, 300) });
      return { ...toActive(s), refreshed: true };
    },

    /** The session and its user, or null when unknown or expired (idle or absolute). */
    async validateSession(sessionId: string): Promise<{ session: ActiveSession; user: SessionUser } | null> {
      const now = Date.now();
      const hit = cache.get(sessionId);
      if (hit && now - hit.at < cacheMs && hit.value.session.expiresAt.getTime() > now) {
        return { session: { ...hit.value.session, refreshed: false }, user: hit.value.user };
      }
      cache.delete(sessionId);
      // lucia writes the extended idle expiry only once half of it has passed, not on every request.
      const { session, user } = await lucia.validateSession(sessionId);
      if (!session || !user) return null;
      const active = toActive(session);
      if (active.createdAt.getTime() + ABSOLUTE_DAYS * DAY_MS <= Date.now()) {
        await lucia.invalidateSession(session.id);
        return null;
      }
      const value = { session: active, user: { id: user.id, email: user.email, name: user.name, createdAt: user.createdAt } };
      if (cacheMs > 0) {
        if (cache.size >= SESSION_CACHE_MAX) cache.delete(cache.keys().next().value!);
        cache.set(sessionId, { at: now, value });
      }
      return value;
    },

    async invalidateSession(sessionId: string): Promise<void> {
      cache.delete(sessionId);
      await lucia.invalidateSession(sessionId);
    },

    async invalidateUserSessions(userId: string): Promise<void> {
      forgetUser(userId);
      await lucia.invalidateUserSessions(userId);
    },

    /** Ends every session of the user except `keepSessionId`. */
    async invalidateOtherSessions(userId: string, keepSessionId: string): Promise<void> {
      forgetUser(userId);
      await db.delete(sessions).where(and(eq(sessions.userId, userId), ne(sessions.id, keepSessionId)));
    },

    /** The user's name, e-mail or password changed: validate their sessions afresh. */
    userChanged(userId: string): void {
      forgetUser(userId);
    },

    async listUserSessions(userId: string, currentSessionId?: string): Promise<PublicSession[]> {
      const list = await lucia.getUserSessions(userId);
      return list
        .map(toActive)
        .filter((s) => s.expiresAt.getTime() > Date.now())
        .sort((a, b) => b.createdAt.getTime() - a.createdAt.getTime())
        .map((s) => ({
          id: publicSessionId(s.id),
          createdAt: s.createdAt,
          expiresAt: s.expiresAt,
          userAgent: s.userAgent,
          current: s.id === currentSessionId,
        }));
    },

    /** Ends the user's session with the given public id. Returns whether it was found (and whether it was `currentSessionId`). */
    async invalidateByPublicId(userId: string, publicId: string, currentSessionId?: string): Promise<{ found: boolean; wasCurrent: boolean }> {
      const list = await lucia.getUserSessions(userId);
      const match = list.find((s) => publicSessionId(s.id) === publicId);
      if (!match) return { found: false, wasCurrent: false };
      cache.delete(match.id);
      await lucia.invalidateSession(match.id);
      return { found: true, wasCurrent: match.id === currentSessionId };
    },

    readSessionId(cookieHeader: string | undefined): string | null {
      return cookieHeader ? lucia.readSessionCookie(cookieHeader) : null;
    },

    sessionCookie(session: ActiveSession, secure: boolean): CookieSpec {
      return {
        name: SESSION_COOKIE,
        value: session.id,
        options: { httpOnly: true, sameSite: 'lax', secure, path: '/', expires: session.expiresAt },
      };
    },

    /**
     * A cookie shaped like a new session's (same name, length, alphabet and expiry) that matches no
     * session: what a sign-up with an address that already has an account answers with (ASVS 5.0 6.3.8).
     */
    decoyCookie(secure: boolean): CookieSpec {
      return {
        name: SESSION_COOKIE,
        value: generateIdFromEntropySize(25),
        options: { httpOnly: true, sameSite: 'lax', secure, path: '/', expires: new Date(Date.now() + IDLE_DAYS * DAY_MS) },
      };
    },

    blankCookie(secure: boolean): CookieSpec {
      return {
        name: SESSION_COOKIE,
        value: '',
        options: { httpOnly: true, sameSite: 'lax', secure, path: '/', expires: new Date(0) },
      };
    },

    deleteExpiredSessions(): Promise<void> {
      return lucia.deleteExpiredSessions();
    },
  };
}
