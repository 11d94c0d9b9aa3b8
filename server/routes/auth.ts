import { Router, type Request, type Response } from 'express';
import { signInSchema, signUpSchema } from '../../shared/schemas/auth';
import type { ActiveSession } from '../auth/sessions';
import { DEVICE_COOKIE, DEVICE_COOKIE_DAYS } from '../auth/rate-limit';
import { authOf, requireAuth, secureCookies, type AppDeps } from '../http/context';
import { parse } from '../http/validate';
import { checkCredentials, publicUser, signUp, tooManySignUps, userTeams } from '../services/accounts';
import { getPreferences } from '../services/preferences';

/**
 * The client's address: the socket's, or with TRUST_PROXY = n the address n proxies back in
 * X-Forwarded-For (Express's `trust proxy`, set in server/app.ts).
 */
export function clientIp(req: Request): string {
  return req.ip ?? req.socket.remoteAddress ?? 'unknown';
}

/** One cookie's value from the Cookie header (no cookie-parser in this app). */
export function cookieValue(req: Request, name: string): string | undefined {
  for (const part of (req.get('cookie') ?? '').split(';')) {
    const i = part.indexOf('=');
    if (i > 0 && part.slice(0, i).trim() === name) {
      try {
        return decodeURIComponent(part.slice(i + 1).trim());
      } catch {
        return undefined;
      }
    }
  }
  return undefined;
}

/** The device cookie is sent only to the sign-in routes (OWASP Authentication Cheat Sheet, device cookies). */
const DEVICE_COOKIE_PATH = '/api/auth';

export function authRoutes(deps: AppDeps): Router {
  const { db, sessions, config, limiter, mailer } = deps;
  const r = Router();

  async function endPrevious(res: Response) {
    const previous = authOf(res);
    if (previous) await sessions.invalidateSession(previous.session.id);
  }

  /** Replace any current session with a new one (a fresh id on every sign-in). */
  async function startSession(req: Request, res: Response, userId: string): Promise<ActiveSession> {
    await endPrevious(res);
    const session = await sessions.createSession(userId, req.get('user-agent') ?? '');
    const c = sessions.sessionCookie(session, secureCookies(req, config));
    res.cookie(c.name, c.value, c.options);
    return session;
  }

  // Sign-up answers 201 with a user and a session cookie whether or not the address already has an
  // account (OWASP ASVS 5.0 6.3.8); for a known address both are decoys and its owner gets a
  // "someone tried to sign up with this address" message. Limited per client address.
  r.post('/sign-up', async (req, res) => {
    const input = parse(signUpSchema, req.body);
    const wait = await limiter.signUp(clientIp(req));
    if (wait > 0) throw tooManySignUps(wait);
    const { user, created } = await signUp(db, mailer, config.appOrigin, input);
    if (created) {
      await startSession(req, res, user.id);
    } else {
      await endPrevious(res);
      const c = sessions.decoyCookie(secureCookies(req, config));
      res.cookie(c.name, c.value, c.options);
    }
    res.status(201).json({ user: publicUser(user) });
  });

  r.post('/sign-in', async (req, res) => {
    const input = parse(signInSchema, req.body);
    const user = await checkCredentials(db, limiter, input, clientIp(req), cookieValue(req, DEVICE_COOKIE));
    await startSession(req, res, user.id);
    // A new device cookie on every successful sign-in: this browser is now known for this account.
    res.cookie(DEVICE_COOKIE, await limiter.issueDevice(user.id), {
      httpOnly: true,
      sameSite: 'strict',
      secure: secureCookies(req, config),
      path: DEVICE_COOKIE_PATH,
      maxAge: DEVICE_COOKIE_DAYS * 24 * 60 * 60 * 1000,
    });
    res.json({ user: publicUser(user) });
  });

  r.post('/sign-out', async (req, res) => {
    const auth = authOf(res);
    if (auth) await sessions.invalidateSession(auth.session.id);
    const c = sessions.blankCookie(secureCookies(req, config));
    res.cookie(c.name, c.value, c.options);
    res.status(204).end();
  });

  r.get('/me', async (_req, res) => {
    const { user } = requireAuth(res);
    res.json({ user: publicUser(user), preferences: await getPreferences(db, user.id), teams: await userTeams(db, user.id), demo: config.demo, mailMode: mailer.mode });
  });

  return r;
}
