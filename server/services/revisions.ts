/**
 * Revisions: immutable, numbered snapshots of a diagram (content, content hash, results summary, author,
 * time, message) with a review state. Saving names the revision the edit started from (`baseRevision`);
 * when that is no longer the latest, the save is refused with 409 revision_conflict and the latest
 * revision's details, and nothing is stored. docs/decisions/005-revisions.md.
 */
import { and, desc, eq, sql } from 'drizzle-orm';
import { alias } from 'drizzle-orm/pg-core';
import type { DiagramDocument } from '../../shared/electrical/document/schema';
import type { Db, DbOrTx } from '../db/client';
import { diagramRevisions, diagrams, reviewDecisions, reviewRequests, users } from '../db/schema';
import { conflict, notFound } from './errors';
import { newId } from '../ids';
import { contentHash } from './content-hash';
import { createDiagram, getDiagram } from './diagrams';
import { prepareRevision, type PreparedRevision } from './summaries';
import type { AnalysisPool } from './analysis-pool';
import type { RevisionResultsSummary } from './results-summary';

const author = alias(users, 'author');
const approver = alias(users, 'approver');

const person = (id: string | null, name: string | null) => (id && name !== null ? { id, name } : null);

const revisionMetaColumns = {
  id: diagramRevisions.id,
  diagramId: diagramRevisions.diagramId,
  number: diagramRevisions.number,
  authorId: author.id,
  authorName: author.name,
  createdAt: diagramRevisions.createdAt,
  message: diagramRevisions.message,
  contentHash: diagramRevisions.contentHash,
  state: diagramRevisions.state,
  restoredFrom: diagramRevisions.restoredFrom,
  approvedById: approver.id,
  approvedByName: approver.name,
  approvedAt: diagramRevisions.approvedAt,
  status: sql<RevisionResultsSummary['status']>`${diagramRevisions.resultsSummary}->>'status'`,
  findingCounts: sql<RevisionResultsSummary['findingCounts']>`${diagramRevisions.resultsSummary}->'findingCounts'`,
};

function selectRevisionMeta(db: DbOrTx) {
  return db
    .select(revisionMetaColumns)
    .from(diagramRevisions)
    .leftJoin(author, eq(author.id, diagramRevisions.authorId))
    .leftJoin(approver, eq(approver.id, diagramRevisions.approvedBy));
}

type MetaRow = Awaited<ReturnType<typeof selectRevisionMeta>>[number];

function publicMeta(row: MetaRow) {
  const { id: _id, authorId, authorName, approvedById, approvedByName, status, findingCounts, ...rest } = row;
  void _id;
  return {
    ...rest,
    author: person(authorId, authorName),
    approvedBy: person(approvedById, approvedByName),
    results: { status, findingCounts },
  };
}
export type RevisionMeta = ReturnType<typeof publicMeta>;

/** The revisions of a diagram, newest first, without content. */
export async function listRevisions(db: DbOrTx, diagramId: string) {
  const rows = await selectRevisionMeta(db).where(eq(diagramRevisions.diagramId, diagramId)).orderBy(desc(diagramRevisions.number));
  return rows.map(publicMeta);
}

export async function latestRevision(db: DbOrTx, diagramId: string) {
  const [row] = await selectRevisionMeta(db).where(eq(diagramRevisions.diagramId, diagramId)).orderBy(desc(diagramRevisions.number)).limit(1);
  return row ? publicMeta(row) : null;
}

/** The revision row (id, state, author) for access and review checks; 404 when there is none. */
export async function findRevision(db: DbOrTx, diagramId: string, number: number) {
  const [row] = await db
    .select({ id: diagramRevisions.id, number: diagramRevisions.number, state: diagramRevisions.state, authorId: diagramRevisions.authorId })
    .from(diagramRevisions)
    .where(and(eq(diagramRevisions.diagramId, diagramId), eq(diagramRevisions.number, number)));
  if (!row) throw notFound('No such revision.');
  return row;
}

/** One revision with its content, results summary and review (requested reviewers, decisions). */
export async function getRevision(db: DbOrTx, diagramId: string, number: number) {
  const [row] = await db
    .select({
      meta: revisionMetaColumns,
      content: diagramRevisions.content,
      resultsSummary: diagramRevisions.resultsSummary,
      // Most revisions never see a review: look for its rows only when there are any.
      hasRequests: sql<boolean>`exists (select 1 from "review_requests" rr where rr.revision_id = ${diagramRevisions.id})`,
      hasDecisions: sql<boolean>`exists (select 1 from "review_decisions" rd where rd.revision_id = ${diagramRevisions.id})`,
    })
    .from(diagramRevisions)
    .leftJoin(author, eq(author.id, diagramRevisions.authorId))
    .leftJoin(approver, eq(approver.id, diagramRevisions.approvedBy))
    .where(and(eq(diagramRevisions.diagramId, diagramId), eq(diagramRevisions.number, number)));
  if (!row) throw notFound('No such revision.');
  const reviewer = alias(users, 'reviewer');
  const requestedQuery = () =>
    db
      .select({ id: reviewer.id, name: reviewer.name, requestedAt: reviewRequests.createdAt })
      .from(reviewRequests)
      .innerJoin(reviewer, eq(reviewer.id, reviewRequests.reviewerId))
      .where(eq(reviewRequests.revisionId, row.meta.id))
      .orderBy(reviewRequests.createdAt, reviewer.name);
  const decisionsQuery = () =>
    db
      .select({ reviewerId: reviewer.id, reviewerName: reviewer.name, decision: reviewDecisions.decision, note: reviewDecisions.note, createdAt: reviewDecisions.createdAt })
      .from(reviewDecisions)
      .leftJoin(reviewer, eq(reviewer.id, reviewDecisions.reviewerId))
      .where(eq(reviewDecisions.revisionId, row.meta.id))
      .orderBy(reviewDecisions.createdAt, reviewDecisions.id);
  // Independent reads: in parallel on a PostgreSQL pool (PGlite runs them one after the other anyway).
  const [requested, decisions] = await Promise.all([row.hasRequests ? requestedQuery() : [], row.hasDecisions ? decisionsQuery() : []]);
  return {
    ...publicMeta(row.meta),
    content: row.content as DiagramDocument,
    resultsSummary: row.resultsSummary as RevisionResultsSummary,
    review: {
      reviewers: requested,
      decisions: decisions.map(({ reviewerId, reviewerName, ...d }) => ({ ...d, reviewer: person(reviewerId, reviewerName) })),
    },
  };
}

function conflictDetails(latest: RevisionMeta | null) {
  return latest
    ? { latest: { number: latest.number, author: latest.author, createdAt: latest.createdAt, message: latest.message, contentHash: latest.contentHash, state: latest.state } }
    : { latest: null };
}

/** The unique index on (diagram_id, number) refused an insert: another save took that number first. */
function isRevisionNumberTaken(err: unknown): boolean {
  // drizzle wraps driver errors: look at the cause too.
  for (let e = err as { code?: string; constraint?: string; cause?: unknown } | undefined, depth = 0; e && depth < 3; e = e.cause as typeof e, depth++) {
    if (e.code === '23505' && (e.constraint === undefined || e.constraint === 'diagram_revisions_number_unique')) return true;
  }
  return false;
}

/** 409 revision_conflict naming the latest revision (or 404 when the diagram is gone). */
async function revisionConflict(db: DbOrTx, diagramId: string) {
  const [[diagram], latest] = await Promise.all([
    db.select({ id: diagrams.id }).from(diagrams).where(eq(diagrams.id, diagramId)),
    latestRevision(db, diagramId),
  ]);
  if (!diagram) return notFound('No such diagram.');
  const who = latest?.author ? ` by ${latest.author.name}` : '';
  return conflict(
    'revision_conflict',
    latest
      ? `Revision ${latest.number}${who} was saved after the revision you started from. Compare the two, then save yours on top or as a copy.`
      : 'This diagram has no revisions yet; save with baseRevision null.',
    conflictDetails(latest),
  );
}

/** A restore goes on top of whatever is latest: when another save takes the number first, it tries again. */
const RESTORE_ATTEMPTS = 3;

/**
 * Save a new revision on top of `baseRevision` (null: the diagram has none yet). `baseRevision: 'latest'`
 * (restore) always goes on top of whatever is latest. The content was prepared in a worker
 * (./summaries.ts prepareRevision: validated, analysed, hashed, serialised), so no lock is held while it
 * solves and the request thread does no work on the document.
 *
 * One statement (docs/decisions/011-save-path-and-load-models.md): it reads the diagram and its latest
 * number, inserts the revision as latest + 1 only when that latest is the base, and writes the activity
 * row from the inserted row, all or nothing. No transaction is held open across round trips, so on
 * PGlite (one query at a time) reads wait behind one statement, not a six-statement transaction. Two
 * saves from the same base on PostgreSQL both see the same latest; the unique index on
 * (diagram_id, number) makes the second wait for the first and fail, and that failure is the 409. The
 * answer is built from what was inserted, not read back.
 */
export async function saveRevision(
  db: Db,
  userId: string,
  diagramId: string,
  input: { baseRevision: number | null | 'latest'; message: string; prepared: PreparedRevision; restoredFrom?: number },
): Promise<SavedRevision> {
  const { contentJson, contentHash: hash, resultsSummary } = input.prepared;
  const restoredFrom = input.restoredFrom ?? null;
  const action = restoredFrom !== null ? 'revision.restored' : 'revision.saved';
  const onBase =
    input.baseRevision === 'latest' ? sql`true` : sql`base.latest is not distinct from ${input.baseRevision}::integer`;
  const extraDetail = restoredFrom !== null ? sql` || jsonb_build_object('restoredFrom', ${restoredFrom}::integer)` : sql``;
  type Inserted = { number: number; created_at: string; author_name: string | null };
  const insert = async () =>
    (await db.execute(sql`
      with base as (
        select d.id, d.project_id, d.name,
               (select max(r.number) from diagram_revisions r where r.diagram_id = d.id) as latest
        from diagrams d where d.id = ${diagramId}
      ), saved as (
        insert into diagram_revisions (id, diagram_id, number, author_id, message, content, content_hash, results_summary, restored_from)
        select ${newId()}, base.id, coalesce(base.latest, 0) + 1, ${userId}, ${input.message}, ${contentJson}::jsonb,
               ${hash}, ${JSON.stringify(resultsSummary)}::jsonb, ${restoredFrom}::integer
        from base where ${onBase}
        returning number, created_at
      ), logged as (
        insert into activity (id, project_id, user_id, action, detail)
        select ${newId()}, base.project_id, ${userId}, ${action},
               jsonb_build_object('diagramId', base.id, 'name', base.name, 'number', saved.number, 'message', ${input.message}::text)${extraDetail}
        from base, saved
      )
      select saved.number, saved.created_at, (select u.name from users u where u.id = ${userId}) as author_name from saved`)) as unknown as { rows: Inserted[] };

  let row: Inserted | undefined;
  for (let attempt = 1; ; attempt++) {
    try {
      [row] = (await insert()).rows;
      break;
    } catch (err) {
      if (!isRevisionNumberTaken(err)) throw err;
      if (input.baseRevision !== 'latest' || attempt >= RESTORE_ATTEMPTS) throw await revisionConflict(db, diagramId);
    }
  }
  if (!row) throw await revisionConflict(db, diagramId);

  const meta: RevisionMeta = {
    diagramId,
    number: Number(row.number),
    createdAt: diagramRevisions.createdAt.mapFromDriverValue(row.created_at) as Date, // both drivers hand timestamptz over as text here
    message: input.message,
    contentHash: hash,
    state: 'draft',
    restoredFrom,
    approvedAt: null,
    author: person(userId, row.author_name),
    approvedBy: null,
    results: { status: resultsSummary.status, findingCounts: resultsSummary.findingCounts },
  };
  return { meta, contentJson, resultsSummary };
}

/** A saved revision: its details, its content as JSON text and its results summary. */
export interface SavedRevision {
  meta: RevisionMeta;
  contentJson: string;
  resultsSummary: RevisionResultsSummary;
}

/**
 * `{"revision": …}` of a just-saved revision, shaped as GET …/revisions/:n answers it (a new revision has
 * no review yet). The content's JSON text from the worker goes in as is: a 2,000-part document is not
 * serialised again on the request thread.
 */
export function savedRevisionJson(saved: SavedRevision): string {
  const head = JSON.stringify(saved.meta);
  return `{"revision":${head.slice(0, -1)},"content":${saved.contentJson},"resultsSummary":${JSON.stringify(saved.resultsSummary)},"review":{"reviewers":[],"decisions":[]}}}`;
}

export async function restoreRevision(db: Db, userId: string, diagramId: string, number: number, message: string | undefined, pool?: AnalysisPool) {
  const [source] = await db
    .select({ content: diagramRevisions.content })
    .from(diagramRevisions)
    .where(and(eq(diagramRevisions.diagramId, diagramId), eq(diagramRevisions.number, number)));
  if (!source) throw notFound('No such revision.');
  // A stored revision is taken as stored (not validated again): it was valid when it was saved.
  const prepared = await prepareRevision(source.content, { validate: false }, pool);
  if (!prepared.ok) throw new Error('a stored revision failed to prepare');
  return saveRevision(db, userId, diagramId, {
    baseRevision: 'latest',
    message: message || `Restored revision ${number}`,
    prepared: prepared.revision,
    restoredFrom: number,
  });
}

/** A new diagram in the same project from a revision's content (default the latest; the working copy when there is none). */
export async function duplicateDiagram(
  db: Db,
  userId: string,
  diagramId: string,
  input: { name: string; description?: string; revision?: number },
) {
  const [diagram] = await db.select().from(diagrams).where(eq(diagrams.id, diagramId));
  if (!diagram) throw notFound('No such diagram.');
  let content = diagram.content as DiagramDocument;
  let from: number | null = null;
  const [rev] = await db
    .select({ number: diagramRevisions.number, content: diagramRevisions.content })
    .from(diagramRevisions)
    .where(and(eq(diagramRevisions.diagramId, diagramId), input.revision !== undefined ? eq(diagramRevisions.number, input.revision) : undefined))
    .orderBy(desc(diagramRevisions.number))
    .limit(1);
  if (input.revision !== undefined && !rev) throw notFound('No such revision.');
  if (rev) {
    content = rev.content as DiagramDocument;
    from = rev.number;
  }
  return createDiagram(
    db,
    userId,
    diagram.projectId,
    { name: input.name, description: input.description ?? diagram.description, content: { ...content, name: input.name } },
    { action: 'diagram.duplicated', detail: { sourceDiagramId: diagramId, sourceName: diagram.name, sourceRevision: from } },
  );
}

/** Latest revision number and state of every diagram in a project (for the diagram list). */
export async function latestRevisionStatesInProject(db: DbOrTx, projectId: string) {
  const rows = await db
    .selectDistinctOn([diagramRevisions.diagramId], { diagramId: diagramRevisions.diagramId, number: diagramRevisions.number, state: diagramRevisions.state })
    .from(diagramRevisions)
    .innerJoin(diagrams, eq(diagrams.id, diagramRevisions.diagramId))
    .where(eq(diagrams.projectId, projectId))
    .orderBy(diagramRevisions.diagramId, desc(diagramRevisions.number));
  return new Map(rows.map((r) => [r.diagramId, { number: r.number, state: r.state }]));
}

/** GET /api/diagrams/:id: the working copy, the hash of its content and the latest revision's details. */
export async function getDiagramWithLatest(db: DbOrTx, diagramId: string) {
  const [diagram, latest] = await Promise.all([getDiagram(db, diagramId), latestRevision(db, diagramId)]);
  return { ...diagram, workingCopyHash: contentHash(diagram.content), latestRevision: latest };
}
