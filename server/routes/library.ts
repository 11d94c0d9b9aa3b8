/** The team parts library (docs/api.md "Parts library"): every member reads; owners and designers (project.edit) write. */
import { Router } from 'express';
import { libraryToCsv, type LibraryItem } from '../../shared/library';
import { createLibraryItemSchema, importLibrarySchema, updateLibraryItemSchema } from '../../shared/schemas/library';
import { requireAuth, type AppDeps } from '../http/context';
import { parse } from '../http/validate';
import { requireTeamRole } from '../services/access';
import { createLibraryItem, deleteLibraryItem, importLibraryCsv, listLibrary, updateLibraryItem } from '../services/library';
import { getTeam } from '../services/teams';

/** A file name for the export from the team's name: letters, digits and hyphens. */
function exportFileName(teamName: string): string {
  const slug = teamName
    .normalize('NFKD')
    .replace(/[^A-Za-z0-9]+/g, '-')
    .replace(/^-+|-+$/g, '')
    .toLowerCase()
    .slice(0, 60);
  return `${slug || 'team'}-parts-library.csv`;
}

export function libraryRoutes(deps: AppDeps): Router {
  const { db } = deps;
  const r = Router();

  r.get('/teams/:teamId/library', async (req, res) => {
    const { user } = requireAuth(res);
    await requireTeamRole(db, user.id, req.params.teamId, 'project.read');
    res.json({ items: await listLibrary(db, req.params.teamId) });
  });

  r.post('/teams/:teamId/library', async (req, res) => {
    const { user } = requireAuth(res);
    await requireTeamRole(db, user.id, req.params.teamId, 'project.edit');
    const input = parse(createLibraryItemSchema, req.body);
    res.status(201).json({ item: await createLibraryItem(db, user.id, req.params.teamId, input) });
  });

  r.get('/teams/:teamId/library/export', async (req, res) => {
    const { user } = requireAuth(res);
    await requireTeamRole(db, user.id, req.params.teamId, 'project.read');
    const team = await getTeam(db, user.id, req.params.teamId);
    const items = await listLibrary(db, req.params.teamId);
    const csv = libraryToCsv(
      items.map(({ id, kind, name, manufacturer, partNumber, props }) => ({ id, kind, name, manufacturer, partNumber, props }) as LibraryItem),
    );
    res.set({ 'Content-Type': 'text/csv; charset=utf-8', 'Content-Disposition': `attachment; filename="${exportFileName(team.name)}"`, 'X-Content-Type-Options': 'nosniff' });
    res.send(csv);
  });

  r.post('/teams/:teamId/library/import', async (req, res) => {
    const { user } = requireAuth(res);
    await requireTeamRole(db, user.id, req.params.teamId, 'project.edit');
    const input = parse(importLibrarySchema, req.body);
    res.json(await importLibraryCsv(db, user.id, req.params.teamId, input.csv, input.mode));
  });

  r.patch('/teams/:teamId/library/:itemId', async (req, res) => {
    const { user } = requireAuth(res);
    await requireTeamRole(db, user.id, req.params.teamId, 'project.edit');
    const input = parse(updateLibraryItemSchema, req.body);
    res.json({ item: await updateLibraryItem(db, user.id, req.params.teamId, req.params.itemId, input) });
  });

  r.delete('/teams/:teamId/library/:itemId', async (req, res) => {
    const { user } = requireAuth(res);
    await requireTeamRole(db, user.id, req.params.teamId, 'project.edit');
    await deleteLibraryItem(db, req.params.teamId, req.params.itemId);
    res.status(204).end();
  });

  return r;
}
