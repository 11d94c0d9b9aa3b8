import { asc, desc, eq, sql } from 'drizzle-orm';
import type { Db } from '../db/client';
import { activity, diagrams, projects, uploads } from '../db/schema';
import { newId } from '../ids';
import { latestRevisionStatesInProject } from './revisions';

// Table-qualified by hand: drizzle leaves columns unqualified in single-table selects, which would bind to d.
const diagramCount = sql<number>`(select count(*)::int from "diagrams" d where d.project_id = "projects"."id")`;

const projectColumns = {
  id: projects.id,
  teamId: projects.teamId,
  name: projects.name,
  site: projects.site,
  description: projects.description,
  createdAt: projects.createdAt,
  updatedAt: projects.updatedAt,
  diagramCount,
};

export async function listProjects(db: Db, teamId: string) {
  return db
    .select(projectColumns)
    .from(projects)
    .where(eq(projects.teamId, teamId))
    .orderBy(desc(projects.updatedAt), asc(projects.id));
}

export async function getProject(db: Db, projectId: string) {
  const [row] = await db.select(projectColumns).from(projects).where(eq(projects.id, projectId));
  return row;
}

export async function createProject(
  db: Db,
  userId: string,
  input: { teamId: string; name: string; site: string; description: string },
) {
  const id = newId();
  await db.transaction(async (tx) => {
    await tx.insert(projects).values({ id, ...input, createdBy: userId });
    await tx.insert(activity).values({ id: newId(), projectId: id, userId, action: 'project.created', detail: { name: input.name } });
  });
  return getProject(db, id);
}

export async function updateProject(
  db: Db,
  userId: string,
  projectId: string,
  input: { name?: string; site?: string; description?: string },
) {
  await db.transaction(async (tx) => {
    await tx
      .update(projects)
      .set({ ...input, updatedAt: new Date() })
      .where(eq(projects.id, projectId));
    await tx.insert(activity).values({ id: newId(), projectId, userId, action: 'project.updated', detail: { fields: Object.keys(input) } });
  });
  return getProject(db, projectId);
}

/** Deletes the project (diagrams, revisions, uploads cascade); returns the storage keys of its uploads to remove. */
export async function deleteProject(db: Db, projectId: string): Promise<string[]> {
  return db.transaction(async (tx) => {
    const keys = (await tx.select({ key: uploads.key }).from(uploads).where(eq(uploads.projectId, projectId))).map((r) => r.key);
    await tx.delete(projects).where(eq(projects.id, projectId));
    return keys;
  });
}

export async function listDiagrams(db: Db, projectId: string) {
  // Two independent reads (in parallel on a PostgreSQL pool).
  const [rows, latest] = await Promise.all([
    db
      .select({ id: diagrams.id, projectId: diagrams.projectId, name: diagrams.name, description: diagrams.description, updatedAt: diagrams.updatedAt, partCount: diagrams.partCount })
      .from(diagrams)
      .where(eq(diagrams.projectId, projectId))
      .orderBy(asc(diagrams.createdAt), asc(diagrams.id)),
    latestRevisionStatesInProject(db, projectId),
  ]);
  return rows.map((r) => ({ ...r, latestRevision: latest.get(r.id) ?? null }));
}
