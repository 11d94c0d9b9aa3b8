/**
 * Diagrams and their working copy: the document the editor autosaves. The working copy is guarded by
 * `workingCopyVersion` (optimistic concurrency): a save names the version it started from and is refused
 * with 409 working_copy_conflict when someone saved since. Revisions (immutable snapshots) are in
 * ./revisions.ts.
 */
import { and, eq, sql } from 'drizzle-orm';
import { alias } from 'drizzle-orm/pg-core';
import { emptyDiagram, type DiagramAnnotation, type DiagramDocument } from '../../shared/electrical/document/schema';
import { parseAnnotations } from '../../shared/diagram/annotations';
import type { Db, DbOrTx } from '../db/client';
import { activity, diagrams, projects, users } from '../db/schema';
import { conflict, invalidFields, notFound } from './errors';
import { newId } from '../ids';
import { copyName as copyNameOf } from '../../shared/schemas/diagrams';

const updater = alias(users, 'updater');

const diagramColumns = {
  id: diagrams.id,
  projectId: diagrams.projectId,
  teamId: projects.teamId,
  projectName: projects.name,
  name: diagrams.name,
  description: diagrams.description,
  content: diagrams.content,
  workingCopyVersion: diagrams.workingCopyVersion,
  createdAt: diagrams.createdAt,
  updatedAt: diagrams.updatedAt,
  updatedById: updater.id,
  updatedByName: updater.name,
};

function selectDiagrams(db: DbOrTx) {
  return db
    .select(diagramColumns)
    .from(diagrams)
    .innerJoin(projects, eq(projects.id, diagrams.projectId))
    .leftJoin(updater, eq(updater.id, diagrams.updatedBy));
}

type DiagramSelect = Awaited<ReturnType<typeof selectDiagrams>>[number];

function publicDiagram(row: DiagramSelect) {
  const { updatedById, updatedByName, ...rest } = row;
  return { ...rest, updatedBy: updatedById && updatedByName !== null ? { id: updatedById, name: updatedByName } : null };
}

export type DiagramRecord = ReturnType<typeof publicDiagram>;

/** The working copy's document as stored (unvalidated); 404 when there is no such diagram. */
export async function workingCopyContent(db: DbOrTx, diagramId: string): Promise<unknown> {
  const [row] = await db.select({ content: diagrams.content }).from(diagrams).where(eq(diagrams.id, diagramId));
  if (!row) throw notFound('No such diagram.');
  return row.content;
}

export async function getDiagram(db: DbOrTx, diagramId: string) {
  const [row] = await selectDiagrams(db).where(eq(diagrams.id, diagramId));
  if (!row) throw notFound('No such diagram.');
  return publicDiagram(row);
}

export async function createDiagram(
  db: Db,
  userId: string,
  projectId: string,
  input: { name: string; description: string; content?: DiagramDocument },
  action: { action: string; detail?: Record<string, unknown> } = { action: 'diagram.created' },
) {
  const id = newId();
  const content = input.content ?? emptyDiagram(input.name);
  await db.transaction(async (tx) => {
    await tx.insert(diagrams).values({ id, projectId, name: input.name, description: input.description, content, createdBy: userId, updatedBy: userId });
    await tx.insert(activity).values({ id: newId(), projectId, userId, action: action.action, detail: { diagramId: id, name: input.name, ...action.detail } });
  });
  return getDiagram(db, id);
}

export async function updateDiagram(db: Db, userId: string, diagramId: string, input: { name?: string; description?: string }) {
  await db.transaction(async (tx) => {
    const [before] = await tx.select({ name: diagrams.name, projectId: diagrams.projectId }).from(diagrams).where(eq(diagrams.id, diagramId)).for('update');
    if (!before) throw notFound('No such diagram.');
    await tx
      .update(diagrams)
      .set({ ...input, updatedAt: new Date(), updatedBy: userId })
      .where(eq(diagrams.id, diagramId));
    const renamed = input.name !== undefined && input.name !== before.name;
    await tx.insert(activity).values({
      id: newId(),
      projectId: before.projectId,
      userId,
      action: renamed ? 'diagram.renamed' : 'diagram.updated',
      detail: { diagramId, name: input.name ?? before.name, ...(renamed ? { previousName: before.name } : {}), fields: Object.keys(input) },
    });
  });
  return getDiagram(db, diagramId);
}

export async function deleteDiagram(db: Db, userId: string, diagramId: string) {
  await db.transaction(async (tx) => {
    const [gone] = await tx.delete(diagrams).where(eq(diagrams.id, diagramId)).returning({ projectId: diagrams.projectId, name: diagrams.name });
    if (!gone) throw notFound('No such diagram.');
    await tx.insert(activity).values({ id: newId(), projectId: gone.projectId, userId, action: 'diagram.deleted', detail: { diagramId, name: gone.name } });
  });
}

/**
 * Replace the working copy when `baseVersion` is still the current version (one atomic UPDATE, so two
 * concurrent saves from the same version cannot both succeed). Working-copy saves are autosaves and are
 * not written to the activity log; saved revisions are.
 */
export async function saveWorkingCopy(db: Db, userId: string, diagramId: string, content: DiagramDocument, baseVersion: number) {
  const [saved] = await db
    .update(diagrams)
    .set({ content, workingCopyVersion: sql`${diagrams.workingCopyVersion} + 1`, updatedAt: new Date(), updatedBy: userId })
    .where(and(eq(diagrams.id, diagramId), eq(diagrams.workingCopyVersion, baseVersion)))
    .returning({ workingCopyVersion: diagrams.workingCopyVersion, updatedAt: diagrams.updatedAt });
  if (saved) return saved;
  throw await workingCopyConflict(db, diagramId);
}

/** 409 working_copy_conflict naming who saved the current version. */
async function workingCopyConflict(db: DbOrTx, diagramId: string) {
  const current = await getDiagram(db, diagramId);
  return conflict(
    'working_copy_conflict',
    current.updatedBy
      ? `${current.updatedBy.name} saved this diagram since you opened it (version ${current.workingCopyVersion}).`
      : `This diagram was saved since you opened it (version ${current.workingCopyVersion}).`,
    { workingCopyVersion: current.workingCopyVersion, updatedAt: current.updatedAt, updatedBy: current.updatedBy },
  );
}

/** "$.annotations[0].partId" -> "annotations.0.partId" (the API's field paths). */
const dottedPath = (jsonPath: string) => jsonPath.replace(/^\$\.?/, '').replace(/\[(\d+)\]/g, '.$1');

/**
 * Replace only the working copy's annotation layer (trainers annotate; they never change the electrical
 * model). Same optimistic concurrency as saveWorkingCopy: the row is locked, `baseVersion` must be the
 * current version (else 409 working_copy_conflict), and the version moves on by one. Each annotation of
 * a known kind is checked strictly (shared/diagram/annotations.ts) against the parts of the current copy;
 * ids must not clash with part or cable ids. Entries of kinds a later version may add are kept as given.
 */
export async function saveAnnotations(db: Db, userId: string, diagramId: string, annotations: DiagramAnnotation[], baseVersion: number) {
  return db.transaction(async (tx) => {
    const [row] = await tx
      .select({ content: diagrams.content, version: diagrams.workingCopyVersion })
      .from(diagrams)
      .where(eq(diagrams.id, diagramId))
      .for('update');
    if (!row) throw notFound('No such diagram.');
    if (row.version !== baseVersion) throw await workingCopyConflict(tx, diagramId);
    const content = row.content as Partial<DiagramDocument>;
    const parts = Array.isArray(content.parts) ? content.parts : [];
    const cables = Array.isArray(content.cables) ? content.cables : [];
    const fields: Record<string, string[]> = {};
    const add = (path: string, message: string) => (fields[path] ??= []).push(message);
    for (const issue of parseAnnotations(annotations, new Set(parts.map((p) => p.id))).issues) add(dottedPath(issue.path), issue.message);
    const taken = new Set([...parts.map((p) => p.id), ...cables.map((c) => c.id)]);
    const seen = new Set<string>();
    annotations.forEach((a, i) => {
      if (taken.has(a.id)) add(`annotations.${i}.id`, `Id "${a.id}" is already used by a part or cable`);
      else if (seen.has(a.id)) add(`annotations.${i}.id`, `Duplicate id "${a.id}"`);
      seen.add(a.id);
    });
    if (Object.keys(fields).length) throw invalidFields(fields, 'Some annotations need attention.');
    const [saved] = await tx
      .update(diagrams)
      .set({ content: { ...content, annotations }, workingCopyVersion: sql`${diagrams.workingCopyVersion} + 1`, updatedAt: new Date(), updatedBy: userId })
      .where(eq(diagrams.id, diagramId))
      .returning({ workingCopyVersion: diagrams.workingCopyVersion, updatedAt: diagrams.updatedAt });
    return saved!;
  });
}

/** The project a diagram moves or is copied to, checked to be in the diagram's own team (400 on projectId otherwise). */
function otherTeamError() {
  return invalidFields({ projectId: ['The project must belong to the same team as the diagram'] });
}

/**
 * Move a diagram to another project of the same team. The diagram keeps its id, working copy,
 * revisions, reviews and comments (they hang off the diagram, not the project); both projects' activity
 * records the move. The caller has checked `diagram.edit` on both projects.
 */
export async function moveDiagram(db: Db, userId: string, diagramId: string, target: { id: string; teamId: string; name: string }) {
  await db.transaction(async (tx) => {
    const [row] = await tx
      .select({ name: diagrams.name, projectId: diagrams.projectId, teamId: projects.teamId, projectName: projects.name })
      .from(diagrams)
      .innerJoin(projects, eq(projects.id, diagrams.projectId))
      .where(eq(diagrams.id, diagramId))
      .for('update', { of: diagrams });
    if (!row) throw notFound('No such diagram.');
    if (row.teamId !== target.teamId) throw otherTeamError();
    if (row.projectId === target.id) {
      throw invalidFields({ projectId: ['The diagram is already in this project'] });
    }
    // Only the project changes: the working copy's version, time and author stay (a copy kept in a
    // browser is compared with them when the diagram next opens).
    await tx.update(diagrams).set({ projectId: target.id }).where(eq(diagrams.id, diagramId));
    const base = { diagramId, name: row.name, fromProjectId: row.projectId, fromProjectName: row.projectName, toProjectId: target.id, toProjectName: target.name };
    await tx.insert(activity).values([
      { id: newId(), projectId: row.projectId, userId, action: 'diagram.moved_out', detail: base },
      { id: newId(), projectId: target.id, userId, action: 'diagram.moved_in', detail: base },
    ]);
  });
  return getDiagram(db, diagramId);
}

/**
 * Copy a diagram's working copy (not its revisions, reviews or comments) into a project of the same
 * team, as a new diagram named "<name> (copy)" unless a name is given. The new diagram starts with no
 * revision; the target project's activity records the copy.
 */
export async function copyDiagram(db: Db, userId: string, diagramId: string, target: { id: string; teamId: string; name: string }, name?: string) {
  const id = newId();
  await db.transaction(async (tx) => {
    const [row] = await tx
      .select({ name: diagrams.name, description: diagrams.description, content: diagrams.content, projectId: diagrams.projectId, teamId: projects.teamId, projectName: projects.name })
      .from(diagrams)
      .innerJoin(projects, eq(projects.id, diagrams.projectId))
      .where(eq(diagrams.id, diagramId));
    if (!row) throw notFound('No such diagram.');
    if (row.teamId !== target.teamId) throw otherTeamError();
    const copyName = name ?? copyNameOf(row.name);
    const source = row.content && typeof row.content === 'object' && !Array.isArray(row.content) ? (row.content as Record<string, unknown>) : {};
    await tx.insert(diagrams).values({
      id,
      projectId: target.id,
      name: copyName,
      description: row.description,
      content: { ...source, name: copyName },
      createdBy: userId,
      updatedBy: userId,
    });
    await tx.insert(activity).values({
      id: newId(),
      projectId: target.id,
      userId,
      action: 'diagram.copied',
      detail: { diagramId: id, name: copyName, sourceDiagramId: diagramId, sourceName: row.name, sourceProjectId: row.projectId, sourceProjectName: row.projectName },
    });
  });
  return getDiagram(db, id);
}
