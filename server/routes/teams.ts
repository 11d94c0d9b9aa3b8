import { Router } from 'express';
import { changeRoleSchema, createTeamSchema, inviteSchema, updateTeamSchema } from '../../shared/schemas/teams';
import { can } from '../../shared/roles';
import { requireAuth, type AppDeps } from '../http/context';
import { forbidden, notFound } from '../http/errors';
import { parse } from '../http/validate';
import { requireTeamRole } from '../services/access';
import { createInvite, revokeInvite } from '../services/invites';
import { listOutbox } from '../services/outbox';
import { removeStored } from '../services/uploads';
import { changeRole, createTeam, deleteTeam, getTeam, listMembers, listTeams, removeMember, updateTeam } from '../services/teams';

export function teamRoutes(deps: AppDeps): Router {
  const { db, mailer, config } = deps;
  const r = Router();

  r.get('/', async (_req, res) => {
    const { user } = requireAuth(res);
    res.json({ teams: await listTeams(db, user.id) });
  });

  r.post('/', async (req, res) => {
    const { user } = requireAuth(res);
    const input = parse(createTeamSchema, req.body);
    res.status(201).json({ team: await createTeam(db, user.id, input) });
  });

  r.get('/:teamId', async (req, res) => {
    const { user } = requireAuth(res);
    res.json({ team: await getTeam(db, user.id, req.params.teamId) });
  });

  r.patch('/:teamId', async (req, res) => {
    const { user } = requireAuth(res);
    const { teamId } = req.params;
    await requireTeamRole(db, user.id, teamId, 'team.manage');
    const input = parse(updateTeamSchema, req.body);
    res.json({ team: await updateTeam(db, user.id, teamId, input) });
  });

  r.delete('/:teamId', async (req, res) => {
    const { user } = requireAuth(res);
    const { teamId } = req.params;
    await requireTeamRole(db, user.id, teamId, 'team.manage');
    await removeStored(deps.storage, await deleteTeam(db, teamId));
    res.status(204).end();
  });

  r.get('/:teamId/members', async (req, res) => {
    const { user } = requireAuth(res);
    const { teamId } = req.params;
    const role = await requireTeamRole(db, user.id, teamId);
    res.json(await listMembers(db, teamId, role));
  });

  r.patch('/:teamId/members/:userId', async (req, res) => {
    const { user } = requireAuth(res);
    const { teamId, userId } = req.params;
    await requireTeamRole(db, user.id, teamId, 'team.manage');
    const input = parse(changeRoleSchema, req.body);
    res.json({ member: await changeRole(db, teamId, userId, input.role) });
  });

  r.delete('/:teamId/members/:userId', async (req, res) => {
    const { user } = requireAuth(res);
    const { teamId, userId } = req.params;
    const role = await requireTeamRole(db, user.id, teamId);
    if (userId !== user.id && !can(role, 'team.manage')) throw forbidden();
    await removeMember(db, teamId, userId);
    res.status(204).end();
  });

  r.post('/:teamId/invites', async (req, res) => {
    const { user } = requireAuth(res);
    const { teamId } = req.params;
    await requireTeamRole(db, user.id, teamId, 'team.manage');
    const input = parse(inviteSchema, req.body);
    res.status(201).json({ invite: await createInvite(db, mailer, config.appOrigin, user, teamId, input) });
  });

  r.delete('/:teamId/invites/:inviteId', async (req, res) => {
    const { user } = requireAuth(res);
    const { teamId, inviteId } = req.params;
    await requireTeamRole(db, user.id, teamId, 'team.manage');
    await revokeInvite(db, teamId, inviteId);
    res.status(204).end();
  });

  r.get('/:teamId/outbox', async (req, res) => {
    const { user } = requireAuth(res);
    const { teamId } = req.params;
    await requireTeamRole(db, user.id, teamId, 'outbox.read');
    if (mailer.mode !== 'outbox') throw notFound('Mail is sent by SMTP; there is no local outbox.');
    res.json({ messages: await listOutbox(db, teamId) });
  });

  return r;
}
