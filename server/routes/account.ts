import { Router } from 'express';
import { changeEmailSchema, changePasswordSchema, updateAccountSchema } from '../../shared/schemas/auth';
import { requireAuth, secureCookies, type AppDeps } from '../http/context';
import { notFound } from '../http/errors';
import { parse } from '../http/validate';
import { changeEmail, checkCredentials, publicUser, setPassword, updateName } from '../services/accounts';
import { clientIp } from './auth';

export function accountRoutes(deps: AppDeps): Router {
  const { db, sessions, limiter, config } = deps;
  const r = Router();

  r.patch('/', async (req, res) => {
    const { user } = requireAuth(res);
    const input = parse(updateAccountSchema, req.body);
    const updated = await updateName(db, user.id, input.name);
    sessions.userChanged(user.id);
    res.json({ user: publicUser(updated) });
  });

  // A changed e-mail is a changed sign-in: it asks for the current password, under the sign-in limiter.
  r.patch('/email', async (req, res) => {
    const { user } = requireAuth(res);
    const input = parse(changeEmailSchema, req.body);
    await checkCredentials(db, limiter, { email: user.email, password: input.currentPassword }, clientIp(req));
    const updated = await changeEmail(db, user.id, input.email);
    sessions.userChanged(user.id);
    res.json({ user: publicUser(updated) });
  });

  r.post('/password', async (req, res) => {
    const { user, session } = requireAuth(res);
    const input = parse(changePasswordSchema, req.body);
    // Same limiter as sign-in: a stolen session must not become a password-guessing oracle.
    await checkCredentials(db, limiter, { email: user.email, password: input.currentPassword }, clientIp(req));
    await setPassword(db, user.id, input.newPassword);
    sessions.userChanged(user.id);
    if (input.endOtherSessions) await sessions.invalidateOtherSessions(user.id, session.id);
    res.status(204).end();
  });

  r.get('/sessions', async (_req, res) => {
    const { user, session } = requireAuth(res);
    res.json({ sessions: await sessions.listUserSessions(user.id, session.id) });
  });

  r.delete('/sessions/:id', async (req, res) => {
    const { user, session } = requireAuth(res);
    const { found, wasCurrent } = await sessions.invalidateByPublicId(user.id, req.params.id, session.id);
    if (!found) throw notFound('No such session.');
    if (wasCurrent) {
      const c = sessions.blankCookie(secureCookies(req, config));
      res.cookie(c.name, c.value, c.options);
    }
    res.status(204).end();
  });

  return r;
}
