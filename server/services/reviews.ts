/**
 * Review and sign-off of a revision: review requests to team reviewers, threaded comments (optionally
 * pinned to a part), decisions (approve / request changes), and the e-mail notices for each. States:
 * draft → in_review (review requested) → changes_requested | approved. An approved revision is locked:
 * no further requests or decisions (editing continues in a new revision).
 */
import { and, asc, eq, inArray, isNull, ne } from 'drizzle-orm';
import { alias } from 'drizzle-orm/pg-core';
import { can, type Role } from '../../shared/roles';
import type { DiagramDocument } from '../../shared/electrical/document/schema';
import type { ReviewDecision } from '../../shared/schemas/reviews';
import type { Db, DbOrTx } from '../db/client';
import { activity, diagramRevisions, memberships, reviewComments, reviewDecisions, reviewRequests, users } from '../db/schema';
import { conflict, forbidden, invalidFields, notFound } from './errors';
import { newId } from '../ids';
import type { Mailer } from '../mail/mailer';
import type { DiagramRow, ProjectRow } from './access';
import { reviewNotice } from './notices';
import { notify, readNoticesAbout } from './notifications';
import { errorSummary, log } from '../http/logger';

export interface RevisionContext {
  diagram: DiagramRow;
  project: ProjectRow;
  revision: { id: string; number: number; state: string; authorId: string | null };
}

const revisionLocked = (n: number) =>
  conflict('revision_approved', `Revision ${n} is approved and locked. Save a new revision to continue editing.`);

function fieldError(field: string, message: string) {
  return invalidFields({ [field]: [message] });
}

/** Requested reviewers and decisions of a revision, with its state. */
export async function getReview(db: DbOrTx, revisionId: string) {
  const reviewer = alias(users, 'reviewer');
  const [rev] = await db.select({ number: diagramRevisions.number, state: diagramRevisions.state, approvedAt: diagramRevisions.approvedAt }).from(diagramRevisions).where(eq(diagramRevisions.id, revisionId));
  const reviewers = await db
    .select({ id: reviewer.id, name: reviewer.name, requestedAt: reviewRequests.createdAt })
    .from(reviewRequests)
    .innerJoin(reviewer, eq(reviewer.id, reviewRequests.reviewerId))
    .where(eq(reviewRequests.revisionId, revisionId))
    .orderBy(asc(reviewRequests.createdAt), asc(reviewer.name));
  const decisions = await db
    .select({ reviewerId: reviewer.id, reviewerName: reviewer.name, decision: reviewDecisions.decision, note: reviewDecisions.note, createdAt: reviewDecisions.createdAt })
    .from(reviewDecisions)
    .leftJoin(reviewer, eq(reviewer.id, reviewDecisions.reviewerId))
    .where(eq(reviewDecisions.revisionId, revisionId))
    .orderBy(asc(reviewDecisions.createdAt), asc(reviewDecisions.id));
  return {
    number: rev.number,
    state: rev.state,
    approvedAt: rev.approvedAt,
    reviewers,
    decisions: decisions.map(({ reviewerId, reviewerName, ...d }) => ({ ...d, reviewer: reviewerId && reviewerName !== null ? { id: reviewerId, name: reviewerName } : null })),
  };
}

async function emailsOf(db: DbOrTx, ids: string[]) {
  if (ids.length === 0) return [];
  return db.select({ id: users.id, email: users.email, name: users.name }).from(users).where(inArray(users.id, ids));
}

/** Send notices after the change is committed; a failed message is logged, never undoes the review step. */
async function sendAll(mailer: Mailer, mails: Parameters<Mailer['sendMail']>[0][]) {
  for (const m of mails) {
    try {
      await mailer.sendMail(m);
    } catch (err) {
      log().error({ event: 'mail.failed', mail: 'review-notice', err: errorSummary(err) }, 'review notice not sent');
    }
  }
}

export async function requestReview(
  db: Db,
  mailer: Mailer,
  appOrigin: string,
  user: { id: string; name: string },
  ctx: RevisionContext,
  reviewerIds: string[],
) {
  const { diagram, project, revision } = ctx;
  if (revision.state === 'approved') throw revisionLocked(revision.number);
  const members = await db
    .select({ userId: memberships.userId, role: memberships.role })
    .from(memberships)
    .where(and(eq(memberships.teamId, project.teamId), inArray(memberships.userId, reviewerIds)));
  const roleOf = new Map(members.map((m) => [m.userId, m.role as Role]));
  const fields: Record<string, string[]> = {};
  reviewerIds.forEach((id, i) => {
    const role = roleOf.get(id);
    if (!role) fields[`reviewerIds.${i}`] = ['Not a member of this team'];
    else if (!can(role, 'review.decide')) fields[`reviewerIds.${i}`] = ['This member’s role cannot approve or request changes'];
  });
  if (Object.keys(fields).length > 0) throw invalidFields(fields);

  await db.transaction(async (tx) => {
    await tx
      .insert(reviewRequests)
      .values(reviewerIds.map((reviewerId) => ({ revisionId: revision.id, reviewerId, requestedBy: user.id })))
      .onConflictDoNothing();
    // The lock trigger refuses this if the revision was approved meanwhile.
    const moved = await tx
      .update(diagramRevisions)
      .set({ state: 'in_review' })
      .where(and(eq(diagramRevisions.id, revision.id), ne(diagramRevisions.state, 'approved')))
      .returning({ id: diagramRevisions.id });
    if (moved.length === 0) throw revisionLocked(revision.number);
    await tx.insert(activity).values({
      id: newId(),
      projectId: project.id,
      userId: user.id,
      action: 'review.requested',
      detail: { diagramId: diagram.id, name: diagram.name, number: revision.number, reviewerIds },
    });
    await notify(tx, reviewerIds, { kind: 'review_requested', teamId: project.teamId, actorId: user.id, diagramId: diagram.id, revisionNumber: revision.number });
  });

  const recipients = await emailsOf(db, reviewerIds);
  await sendAll(
    mailer,
    recipients.map((r) =>
      reviewNotice(appOrigin, {
        kind: 'review_requested',
        to: r,
        actor: user,
        diagram: { id: diagram.id, name: diagram.name },
        projectName: project.name,
        revision: revision.number,
        teamId: project.teamId,
      }),
    ),
  );
  return getReview(db, revision.id);
}

const commentAuthor = alias(users, 'comment_author');
const commentResolver = alias(users, 'comment_resolver');

function selectComments(db: DbOrTx) {
  return db
    .select({
      id: reviewComments.id,
      parentId: reviewComments.parentId,
      partId: reviewComments.partId,
      body: reviewComments.body,
      authorId: commentAuthor.id,
      authorName: commentAuthor.name,
      createdAt: reviewComments.createdAt,
      resolvedAt: reviewComments.resolvedAt,
      resolvedById: commentResolver.id,
      resolvedByName: commentResolver.name,
    })
    .from(reviewComments)
    .leftJoin(commentAuthor, eq(commentAuthor.id, reviewComments.authorId))
    .leftJoin(commentResolver, eq(commentResolver.id, reviewComments.resolvedBy));
}

type CommentRow = Awaited<ReturnType<typeof selectComments>>[number];

function publicComment(row: CommentRow) {
  const { authorId, authorName, resolvedById, resolvedByName, ...rest } = row;
  return {
    ...rest,
    author: authorId && authorName !== null ? { id: authorId, name: authorName } : null,
    resolved: row.resolvedAt !== null,
    resolvedBy: resolvedById && resolvedByName !== null ? { id: resolvedById, name: resolvedByName } : null,
  };
}

/** A revision's comments, oldest first; a reply's parentId is its thread's first comment. */
export async function listComments(db: DbOrTx, revisionId: string) {
  const rows = await selectComments(db).where(eq(reviewComments.revisionId, revisionId)).orderBy(asc(reviewComments.createdAt), asc(reviewComments.id));
  return rows.map(publicComment);
}

async function getComment(db: DbOrTx, revisionId: string, commentId: string) {
  const [row] = await selectComments(db).where(and(eq(reviewComments.revisionId, revisionId), eq(reviewComments.id, commentId)));
  if (!row) throw notFound('No such comment.');
  return publicComment(row);
}

export async function addComment(
  db: Db,
  mailer: Mailer,
  appOrigin: string,
  user: { id: string; name: string },
  ctx: RevisionContext,
  input: { body: string; partId?: string; parentId?: string },
) {
  const { diagram, project, revision } = ctx;
  let threadId: string | null = null;
  let partId = input.partId ?? null;
  if (input.parentId) {
    const [parent] = await db
      .select({ id: reviewComments.id, parentId: reviewComments.parentId, partId: reviewComments.partId })
      .from(reviewComments)
      .where(and(eq(reviewComments.id, input.parentId), eq(reviewComments.revisionId, revision.id)));
    if (!parent) throw fieldError('parentId', 'No such comment on this revision');
    threadId = parent.parentId ?? parent.id;
    if (partId === null && threadId === parent.id) partId = parent.partId;
    if (partId === null && threadId !== parent.id) {
      const [root] = await db.select({ partId: reviewComments.partId }).from(reviewComments).where(eq(reviewComments.id, threadId));
      partId = root?.partId ?? null;
    }
  }
  if (input.partId) {
    const [row] = await db.select({ content: diagramRevisions.content }).from(diagramRevisions).where(eq(diagramRevisions.id, revision.id));
    const doc = row.content as DiagramDocument;
    const ids = new Set([...doc.parts.map((p) => p.id), ...doc.cables.map((c) => c.id), ...(doc.annotations ?? []).map((a) => a.id)]);
    if (!ids.has(input.partId)) throw fieldError('partId', `Revision ${revision.number} has no part or cable "${input.partId}"`);
  }

  const id = newId();
  const ids = new Set<string>();
  await db.transaction(async (tx) => {
    await tx.insert(reviewComments).values({ id, revisionId: revision.id, authorId: user.id, parentId: threadId, partId, body: input.body });
    await tx.insert(activity).values({
      id: newId(),
      projectId: project.id,
      userId: user.id,
      action: 'review.commented',
      detail: { diagramId: diagram.id, name: diagram.name, number: revision.number, commentId: id, ...(partId ? { partId } : {}), ...(threadId ? { parentId: threadId } : {}) },
    });
    // The revision's author and everyone else taking part: requested reviewers and earlier commenters.
    const requested = await tx.select({ id: reviewRequests.reviewerId }).from(reviewRequests).where(eq(reviewRequests.revisionId, revision.id));
    const commenters = await tx.selectDistinct({ id: reviewComments.authorId }).from(reviewComments).where(eq(reviewComments.revisionId, revision.id));
    for (const x of [revision.authorId, ...requested.map((r) => r.id), ...commenters.map((c) => c.id)]) if (x && x !== user.id) ids.add(x);
    await readNoticesAbout(tx, user.id, diagram.id, revision.number);
    await notify(tx, ids, {
      kind: threadId ? 'reply' : 'comment',
      teamId: project.teamId,
      actorId: user.id,
      diagramId: diagram.id,
      revisionNumber: revision.number,
      commentId: id,
      excerpt: input.body,
    });
  });

  const recipients = await emailsOf(db, [...ids]);
  await sendAll(
    mailer,
    recipients.map((r) =>
      reviewNotice(appOrigin, {
        kind: 'comment',
        to: r,
        actor: user,
        diagram: { id: diagram.id, name: diagram.name },
        projectName: project.name,
        revision: revision.number,
        teamId: project.teamId,
        body: input.body,
        partId,
      }),
    ),
  );
  return getComment(db, revision.id, id);
}

export async function setCommentResolved(db: Db, user: { id: string }, role: Role, ctx: RevisionContext, commentId: string, resolved: boolean) {
  const { diagram, project, revision } = ctx;
  const [comment] = await db
    .select({ authorId: reviewComments.authorId })
    .from(reviewComments)
    .where(and(eq(reviewComments.id, commentId), eq(reviewComments.revisionId, revision.id)));
  if (!comment) throw notFound('No such comment.');
  // The comment's author, or whoever edits the diagram (designers, owners), may resolve or reopen it.
  if (comment.authorId !== user.id && !can(role, 'diagram.edit')) throw forbidden('Only the comment’s author or a designer can resolve it.');
  await db.transaction(async (tx) => {
    const changed = await tx
      .update(reviewComments)
      .set(resolved ? { resolvedAt: new Date(), resolvedBy: user.id } : { resolvedAt: null, resolvedBy: null })
      .where(and(eq(reviewComments.id, commentId), resolved ? isNull(reviewComments.resolvedAt) : undefined))
      .returning({ id: reviewComments.id });
    if (changed.length > 0) {
      await tx.insert(activity).values({
        id: newId(),
        projectId: project.id,
        userId: user.id,
        action: resolved ? 'review.comment_resolved' : 'review.comment_reopened',
        detail: { diagramId: diagram.id, name: diagram.name, number: revision.number, commentId },
      });
    }
  });
  return getComment(db, revision.id, commentId);
}

export async function decide(
  db: Db,
  mailer: Mailer,
  appOrigin: string,
  user: { id: string; name: string },
  ctx: RevisionContext,
  input: { decision: ReviewDecision; note: string },
) {
  const { diagram, project, revision } = ctx;
  if (revision.state === 'approved') throw revisionLocked(revision.number);
  if (revision.state === 'draft') throw conflict('not_in_review', `Revision ${revision.number} has not been sent for review.`);
  const approve = input.decision === 'approve';
  await db.transaction(async (tx) => {
    const moved = await tx
      .update(diagramRevisions)
      .set(approve ? { state: 'approved', approvedBy: user.id, approvedAt: new Date() } : { state: 'changes_requested' })
      .where(and(eq(diagramRevisions.id, revision.id), inArray(diagramRevisions.state, ['in_review', 'changes_requested'])))
      .returning({ id: diagramRevisions.id });
    if (moved.length === 0) throw revisionLocked(revision.number);
    await tx.insert(reviewDecisions).values({ id: newId(), revisionId: revision.id, reviewerId: user.id, decision: input.decision, note: input.note });
    await tx.insert(activity).values({
      id: newId(),
      projectId: project.id,
      userId: user.id,
      action: 'review.decided',
      detail: { diagramId: diagram.id, name: diagram.name, number: revision.number, decision: input.decision, ...(input.note ? { note: input.note } : {}) },
    });
    await readNoticesAbout(tx, user.id, diagram.id, revision.number);
    if (revision.authorId) {
      await notify(tx, [revision.authorId], {
        kind: approve ? 'approved' : 'changes_requested',
        teamId: project.teamId,
        actorId: user.id,
        diagramId: diagram.id,
        revisionNumber: revision.number,
        excerpt: input.note,
      });
    }
  });
  if (revision.authorId && revision.authorId !== user.id) {
    const recipients = await emailsOf(db, [revision.authorId]);
    await sendAll(
      mailer,
      recipients.map((r) =>
        reviewNotice(appOrigin, {
          kind: 'decision',
          to: r,
          actor: user,
          diagram: { id: diagram.id, name: diagram.name },
          projectName: project.name,
          revision: revision.number,
          teamId: project.teamId,
          decision: input.decision,
          body: input.note,
        }),
      ),
    );
  }
  return getReview(db, revision.id);
}
