import { Router, type Request, type Response } from 'express';
import { signInSchema, signUpSchema } from '../../shared/schemas/auth';
import type { ActiveSession } from '../auth/sessions';
import { authOf, requireAuth, secureCookies, type AppDeps } from '../http/context';
import { parse } from '../http/validate';
import { checkCredentials, publicUser, signUp, userTeams } from '../services/accounts';
import { getPreferences } from '../services/preferences';

export function clientIp(req: Request): string {
  return req.ip ?? req.socket.remoteAddress ?? 'unknown';
}

export function authRoutes(deps: AppDeps): Router {
  const { db, sessions, config, limiter, mailer } = deps;
  const r = Router();

  /** Replace any current session with a new one (a fresh id on every sign-in). */
  async function startSession(req: Request, res: Response, userId: string): Promise<ActiveSession> {
    const previous = authOf(res);
    if (previous) await sessions.invalidateSession(previous.session.id);
    const session = await sessions.createSession(userId, req.get('user-agent') ?? '');
    const c = sessions.sessionCookie(session, secureCookies(req, config));
    res.cookie(c.name, c.value, c.options);
    return session;
  }

  r.post('/sign-up', async (req, res) => {
    const input = parse(signUpSchema, req.body);
    const user = await signUp(db, input);
    await startSession(req, res, user.id);
    res.status(201).json({ user: publicUser(user) });
  });

  r.post('/sign-in', async (req, res) => {
    const input = parse(signInSchema, req.body);
    const user = await checkCredentials(db, limiter, input, clientIp(req));
    await startSession(req, res, user.id);
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
