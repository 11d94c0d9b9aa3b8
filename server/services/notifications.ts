/**
 * In-app notifications: one row per recipient for each review event that also sends an e-mail (review
 * requested, changes requested, approved, comment, reply), so a team without a mail server still reaches
 * everyone. Rows are written in the same transaction as the event itself. A user sees only their own rows,
 * and only for teams they are still a member of (OWASP ASVS 5.0 8.2.2: data-specific access control).
 */
import { and, desc, eq, inArray, isNull, sql } from 'drizzle-orm';
import { alias } from 'drizzle-orm/pg-core';
import type { DbOrTx } from '../db/client';
import { diagramRevisions, diagrams, mailOutbox, notifications, projects, reviewDecisions, reviewRequests, teams, users } from '../db/schema';
import { newId } from '../ids';

export type NotificationKind = (typeof notifications.$inferInsert)['kind'];

const EXCERPT_MAX = 200;

export function excerptOf(text: string): string {
  const flat = text.replace(/\s+/g, ' ').trim();
  return flat.length > EXCERPT_MAX ? `${flat.slice(0, EXCERPT_MAX - 1)}…` : flat;
}

export interface NewNotice {
  kind: NotificationKind;
  teamId: string;
  actorId: string;
  diagramId: string;
  revisionNumber: number;
  commentId?: string | null;
  excerpt?: string;
}

/** Stores one notice per recipient (never to the actor themself). Call inside the event's transaction. */
export async function notify(tx: DbOrTx, recipientIds: Iterable<string>, n: NewNotice): Promise<void> {
  const ids = [...new Set(recipientIds)].filter((id) => id !== n.actorId);
  if (ids.length === 0) return;
  await tx.insert(notifications).values(
    ids.map((userId) => ({
      id: newId(),
      userId,
      teamId: n.teamId,
      kind: n.kind,
      actorId: n.actorId,
      diagramId: n.diagramId,
      revisionNumber: n.revisionNumber,
      commentId: n.commentId ?? null,
      excerpt: excerptOf(n.excerpt ?? ''),
    })),
  );
}

/** The app path a notice or a waiting revision opens: compare with the revision before, or the first revision. */
export function revisionPath(diagramId: string, revision: number): string {
  const id = encodeURIComponent(diagramId);
  return revision > 1 ? `/diagrams/${id}/compare?a=${revision - 1}&b=${revision}` : `/diagrams/${id}/revisions/${revision}`;
}

/** Only rows of teams the user belongs to now. */
const memberOfTeam = (userId: string, teamColumn: typeof notifications.teamId | typeof projects.teamId) =>
  sql`exists (select 1 from "memberships" m where m.user_id = ${userId} and m.team_id = ${teamColumn})`;

export async function unreadCount(db: DbOrTx, userId: string): Promise<number> {
  const [row] = await db
    .select({ n: sql<number>`count(*)::int` })
    .from(notifications)
    .where(and(eq(notifications.userId, userId), isNull(notifications.readAt), memberOfTeam(userId, notifications.teamId)));
  return row.n;
}

export async function listNotifications(db: DbOrTx, userId: string, opts: { unreadOnly: boolean; limit: number }) {
  const actor = alias(users, 'actor');
  const rows = await db
    .select({
      id: notifications.id,
      kind: notifications.kind,
      teamId: notifications.teamId,
      teamName: teams.name,
      actorId: actor.id,
      actorName: actor.name,
      diagramId: notifications.diagramId,
      diagramName: diagrams.name,
      projectId: projects.id,
      projectName: projects.name,
      revision: notifications.revisionNumber,
      commentId: notifications.commentId,
      excerpt: notifications.excerpt,
      readAt: notifications.readAt,
      createdAt: notifications.createdAt,
    })
    .from(notifications)
    .innerJoin(teams, eq(teams.id, notifications.teamId))
    .innerJoin(diagrams, eq(diagrams.id, notifications.diagramId))
    .innerJoin(projects, eq(projects.id, diagrams.projectId))
    .leftJoin(actor, eq(actor.id, notifications.actorId))
    .where(
      and(
        eq(notifications.userId, userId),
        memberOfTeam(userId, notifications.teamId),
        opts.unreadOnly ? isNull(notifications.readAt) : undefined,
      ),
    )
    .orderBy(desc(notifications.createdAt), desc(notifications.id))
    .limit(opts.limit);
  return rows.map(({ actorId, actorName, teamId, teamName, diagramId, diagramName, projectId, projectName, ...r }) => ({
    ...r,
    read: r.readAt !== null,
    team: { id: teamId, name: teamName },
    actor: actorId && actorName !== null ? { id: actorId, name: actorName } : null,
    diagram: { id: diagramId, name: diagramName },
    project: { id: projectId, name: projectName },
    path: revisionPath(diagramId, r.revision),
  }));
}

/** Acting on a revision (comment, decision) reads the actor's own notices about it. Call inside the event's transaction. */
export async function readNoticesAbout(tx: DbOrTx, userId: string, diagramId: string, revisionNumber: number): Promise<void> {
  await tx
    .update(notifications)
    .set({ readAt: new Date() })
    .where(and(eq(notifications.userId, userId), eq(notifications.diagramId, diagramId), eq(notifications.revisionNumber, revisionNumber), isNull(notifications.readAt)));
}

/** Marks the given notices (or all) read; ids that are not the user's change nothing. Returns the unread count. */
export async function markRead(db: DbOrTx, userId: string, input: { ids?: string[]; all?: boolean }): Promise<number> {
  await db
    .update(notifications)
    .set({ readAt: new Date() })
    .where(and(eq(notifications.userId, userId), isNull(notifications.readAt), input.all ? undefined : inArray(notifications.id, input.ids ?? [])));
  return unreadCount(db, userId);
}

/**
 * Work that waits for the user, across their teams: revisions they were asked to review and have not decided
 * since; their own revisions with changes requested; recent approvals in their teams.
 */
export async function listWork(db: DbOrTx, userId: string) {
  const base = {
    diagramId: diagrams.id,
    diagramName: diagrams.name,
    projectId: projects.id,
    projectName: projects.name,
    teamId: teams.id,
    teamName: teams.name,
    revision: diagramRevisions.number,
    state: diagramRevisions.state,
    message: diagramRevisions.message,
    createdAt: diagramRevisions.createdAt,
  };
  const from = () =>
    db
      .select({ ...base, requestedAt: reviewRequests.createdAt })
      .from(diagramRevisions)
      .innerJoin(diagrams, eq(diagrams.id, diagramRevisions.diagramId))
      .innerJoin(projects, eq(projects.id, diagrams.projectId))
      .innerJoin(teams, eq(teams.id, projects.teamId));

  const waiting = await from()
    .innerJoin(reviewRequests, and(eq(reviewRequests.revisionId, diagramRevisions.id), eq(reviewRequests.reviewerId, userId)))
    .where(
      and(
        eq(diagramRevisions.state, 'in_review'),
        memberOfTeam(userId, projects.teamId),
        // Not decided by this reviewer since the request.
        sql`not exists (select 1 from ${reviewDecisions} d where d.revision_id = ${diagramRevisions.id} and d.reviewer_id = ${userId} and d.created_at >= ${reviewRequests.createdAt})`,
      ),
    )
    .orderBy(desc(reviewRequests.createdAt))
    .limit(50);

  const approver = alias(users, 'approver');
  const changes = await db
    .select(base)
    .from(diagramRevisions)
    .innerJoin(diagrams, eq(diagrams.id, diagramRevisions.diagramId))
    .innerJoin(projects, eq(projects.id, diagrams.projectId))
    .innerJoin(teams, eq(teams.id, projects.teamId))
    .where(and(eq(diagramRevisions.state, 'changes_requested'), eq(diagramRevisions.authorId, userId), memberOfTeam(userId, projects.teamId)))
    .orderBy(desc(diagramRevisions.createdAt))
    .limit(50);

  const approvals = await db
    .select({ ...base, approvedAt: diagramRevisions.approvedAt, approverName: approver.name })
    .from(diagramRevisions)
    .innerJoin(diagrams, eq(diagrams.id, diagramRevisions.diagramId))
    .innerJoin(projects, eq(projects.id, diagrams.projectId))
    .innerJoin(teams, eq(teams.id, projects.teamId))
    .leftJoin(approver, eq(approver.id, diagramRevisions.approvedBy))
    .where(and(eq(diagramRevisions.state, 'approved'), memberOfTeam(userId, projects.teamId)))
    .orderBy(desc(diagramRevisions.approvedAt))
    .limit(10);

  const item = (r: { diagramId: string; diagramName: string; projectId: string; projectName: string; teamId: string; teamName: string; revision: number; state: string; message: string; createdAt: Date }) => ({
    diagram: { id: r.diagramId, name: r.diagramName },
    project: { id: r.projectId, name: r.projectName },
    team: { id: r.teamId, name: r.teamName },
    revision: r.revision,
    state: r.state,
    message: r.message,
    createdAt: r.createdAt,
    path: revisionPath(r.diagramId, r.revision),
  });
  return {
    waitingForReview: waiting.map((r) => ({ ...item(r), requestedAt: r.requestedAt })),
    changesRequested: changes.map((r) => ({ ...item(r), historyPath: `/diagrams/${encodeURIComponent(r.diagramId)}/history` })),
    recentApprovals: approvals.map((r) => ({ ...item(r), approvedAt: r.approvedAt, approvedBy: r.approverName })),
  };
}

/** The mail captured for this user (outbox mode): messages whose recipient account is theirs. */
export async function listOwnOutbox(db: DbOrTx, userId: string) {
  return db
    .select({ id: mailOutbox.id, to: mailOutbox.to, subject: mailOutbox.subject, text: mailOutbox.text, html: mailOutbox.html, createdAt: mailOutbox.createdAt })
    .from(mailOutbox)
    .where(eq(mailOutbox.recipientId, userId))
    .orderBy(desc(mailOutbox.createdAt), desc(mailOutbox.id))
    .limit(200);
}
