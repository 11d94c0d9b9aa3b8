import { Router } from 'express';
import { z } from 'zod';
import { createProjectSchema, updateProjectSchema } from '../../shared/schemas/projects';
import { createDiagramSchema } from '../../shared/schemas/diagrams';
import { requireAuth, type AppDeps } from '../http/context';
import { parse } from '../http/validate';
import { requireProjectRole, requireTeamRole } from '../services/access';
import { createProject, deleteProject, getProject, listDiagrams, listProjects, updateProject } from '../services/projects';
import { createDiagram } from '../services/diagrams';
import { listActivity } from '../services/activity';
import { removeStored } from '../services/uploads';

const activityQuery = z.object({
  limit: z.coerce.number().int('limit must be a whole number').min(1, 'limit must be 1–500').max(500, 'limit must be 1–500').default(100),
  before: z.iso.datetime({ offset: true, error: 'before must be an ISO 8601 date-time' }).optional(),
});

const listQuery = z.object({ teamId: z.string({ error: 'teamId is required' }).min(1, 'teamId is required') });

export function projectRoutes(deps: AppDeps): Router {
  const { db } = deps;
  const r = Router();

  r.get('/', async (req, res) => {
    const { user } = requireAuth(res);
    const { teamId } = parse(listQuery, req.query);
    await requireTeamRole(db, user.id, teamId, 'project.read');
    res.json({ projects: await listProjects(db, teamId) });
  });

  r.post('/', async (req, res) => {
    const { user } = requireAuth(res);
    const input = parse(createProjectSchema, req.body);
    await requireTeamRole(db, user.id, input.teamId, 'project.create');
    res.status(201).json({ project: await createProject(db, user.id, input) });
  });

  r.get('/:id', async (req, res) => {
    const { user } = requireAuth(res);
    await requireProjectRole(db, user.id, req.params.id, 'project.read');
    res.json({ project: await getProject(db, req.params.id) });
  });

  r.patch('/:id', async (req, res) => {
    const { user } = requireAuth(res);
    await requireProjectRole(db, user.id, req.params.id, 'project.edit');
    const input = parse(updateProjectSchema, req.body);
    res.json({ project: await updateProject(db, user.id, req.params.id, input) });
  });

  r.delete('/:id', async (req, res) => {
    const { user } = requireAuth(res);
    await requireProjectRole(db, user.id, req.params.id, 'project.edit');
    await removeStored(deps.storage, await deleteProject(db, req.params.id));
    res.status(204).end();
  });

  r.get('/:id/diagrams', async (req, res) => {
    const { user } = requireAuth(res);
    await requireProjectRole(db, user.id, req.params.id, 'project.read');
    res.json({ diagrams: await listDiagrams(db, req.params.id) });
  });

  r.get('/:id/activity', async (req, res) => {
    const { user } = requireAuth(res);
    await requireProjectRole(db, user.id, req.params.id, 'project.read');
    const q = parse(activityQuery, req.query);
    res.json({ activity: await listActivity(db, req.params.id, { limit: q.limit, before: q.before ? new Date(q.before) : undefined }) });
  });

  r.post('/:id/diagrams', async (req, res) => {
    const { user } = requireAuth(res);
    await requireProjectRole(db, user.id, req.params.id, 'diagram.edit');
    const input = parse(createDiagramSchema, req.body);
    res.status(201).json({ diagram: await createDiagram(db, user.id, req.params.id, input) });
  });

  return r;
}
