import { Router } from 'express';
import { acceptInviteSchema } from '../../shared/schemas/teams';
import { requireAuth, type AppDeps } from '../http/context';
import { notFound } from '../http/errors';
import { parse } from '../http/validate';
import { acceptInvite, describeInvite } from '../services/invites';

export function inviteRoutes(deps: AppDeps): Router {
  const { db } = deps;
  const r = Router();

  // Registered before /:token so "accept" is never read as a token.
  r.post('/accept', async (req, res) => {
    const { user } = requireAuth(res);
    const { token } = parse(acceptInviteSchema, req.body);
    res.json({ team: await acceptInvite(db, user, token) });
  });

  r.get('/:token', async (req, res) => {
    requireAuth(res);
    const { token } = req.params;
    if (token.length > 200) throw notFound('This invitation is unknown, expired or already used.');
    res.json({ invite: await describeInvite(db, token) });
  });

  return r;
}
