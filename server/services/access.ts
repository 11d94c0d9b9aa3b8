/**
 * Role checks for every team-scoped route (shared/roles.ts is the permission table).
 * Not a member (or no such resource) -> 404 not_found; a member without the permission -> 403 forbidden.
 */
import { and, eq } from 'drizzle-orm';
import { can, type Permission, type Role } from '../../shared/roles';
import type { DbOrTx } from '../db/client';
import { diagrams, memberships, projects, uploads } from '../db/schema';
import { forbidden, notFound } from './errors';

export async function membershipRole(db: DbOrTx, userId: string, teamId: string): Promise<Role | null> {
  const [row] = await db
    .select({ role: memberships.role })
    .from(memberships)
    .where(and(eq(memberships.teamId, teamId), eq(memberships.userId, userId)));
  return row?.role ?? null;
}

/** The user's role in the team, checked against `permission` when one is given. */
export async function requireTeamRole(db: DbOrTx, userId: string, teamId: string, permission?: Permission): Promise<Role> {
  const role = await membershipRole(db, userId, teamId);
  if (!role) throw notFound('No such team.');
  if (permission && !can(role, permission)) throw forbidden();
  return role;
}

const projectAccessColumns = { id: projects.id, teamId: projects.teamId, name: projects.name };
export type ProjectRow = { id: string; teamId: string; name: string };

export async function requireProjectRole(
  db: DbOrTx,
  userId: string,
  projectId: string,
  permission: Permission,
): Promise<{ project: ProjectRow; role: Role }> {
  const [row] = await db
    .select({ project: projectAccessColumns, role: memberships.role })
    .from(projects)
    .innerJoin(memberships, and(eq(memberships.teamId, projects.teamId), eq(memberships.userId, userId)))
    .where(eq(projects.id, projectId));
  if (!row) throw notFound('No such project.');
  if (!can(row.role, permission)) throw forbidden();
  return row;
}

/**
 * Access checks select only what their callers use: every API request runs one, and on PGlite a wide
 * row (every column, timestamps, the working copy's content) costs about twice a narrow one.
 */
const diagramAccessColumns = { id: diagrams.id, projectId: diagrams.projectId, name: diagrams.name };
export type DiagramRow = { id: string; projectId: string; name: string };

/** The diagram with its project and the caller's role in the project's team (404 / 403 as above). */
export async function requireDiagramRole(
  db: DbOrTx,
  userId: string,
  diagramId: string,
  permission: Permission,
): Promise<{ diagram: DiagramRow; project: ProjectRow; role: Role }> {
  const [row] = await db
    .select({ diagram: diagramAccessColumns, project: projectAccessColumns, role: memberships.role })
    .from(diagrams)
    .innerJoin(projects, eq(projects.id, diagrams.projectId))
    .innerJoin(memberships, and(eq(memberships.teamId, projects.teamId), eq(memberships.userId, userId)))
    .where(eq(diagrams.id, diagramId));
  if (!row) throw notFound('No such diagram.');
  if (!can(row.role, permission)) throw forbidden();
  return row;
}

export type UploadRow = typeof uploads.$inferSelect;

/** The upload with its project and the caller's role in the project's team (404 / 403 as above). */
export async function requireUploadRole(
  db: DbOrTx,
  userId: string,
  uploadId: string,
  permission: Permission,
): Promise<{ upload: UploadRow; project: ProjectRow; role: Role }> {
  const [row] = await db
    .select({ upload: uploads, project: projectAccessColumns, role: memberships.role })
    .from(uploads)
    .innerJoin(projects, eq(projects.id, uploads.projectId))
    .innerJoin(memberships, and(eq(memberships.teamId, projects.teamId), eq(memberships.userId, userId)))
    .where(eq(uploads.id, uploadId));
  if (!row) throw notFound('No such file.');
  if (!can(row.role, permission)) throw forbidden();
  return row;
}
