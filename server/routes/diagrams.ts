import { Router } from 'express';
import { updateDiagramSchema, workingCopySchema } from '../../shared/schemas/diagrams';
import { requireAuth, type AppDeps } from '../http/context';
import { parse } from '../http/validate';
import { requireDiagramRole } from '../services/access';
import { deleteDiagram, getDiagram, saveWorkingCopy, updateDiagram } from '../services/diagrams';

export function diagramRoutes(deps: AppDeps): Router {
  const { db } = deps;
  const r = Router();

  r.get('/:id', async (req, res) => {
    const { user } = requireAuth(res);
    const { role } = await requireDiagramRole(db, user.id, req.params.id, 'project.read');
    res.json({ diagram: await getDiagram(db, req.params.id), role });
  });

  r.put('/:id/working-copy', async (req, res) => {
    const { user } = requireAuth(res);
    await requireDiagramRole(db, user.id, req.params.id, 'diagram.edit');
    const input = parse(workingCopySchema, req.body);
    res.json(await saveWorkingCopy(db, user.id, req.params.id, input.content, input.baseVersion));
  });

  r.patch('/:id', async (req, res) => {
    const { user } = requireAuth(res);
    await requireDiagramRole(db, user.id, req.params.id, 'diagram.edit');
    const input = parse(updateDiagramSchema, req.body);
    res.json({ diagram: await updateDiagram(db, user.id, req.params.id, input) });
  });

  r.delete('/:id', async (req, res) => {
    const { user } = requireAuth(res);
    await requireDiagramRole(db, user.id, req.params.id, 'diagram.edit');
    await deleteDiagram(db, user.id, req.params.id);
    res.status(204).end();
  });

  return r;
}
