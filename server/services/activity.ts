/** The project activity log: who did what, when. Rows are written by each service in its transaction. */
import { and, desc, eq, lt } from 'drizzle-orm';
import type { DbOrTx } from '../db/client';
import { activity, users } from '../db/schema';

export async function listActivity(db: DbOrTx, projectId: string, opts: { limit: number; before?: Date }) {
  const rows = await db
    .select({ id: activity.id, action: activity.action, detail: activity.detail, createdAt: activity.createdAt, userId: users.id, userName: users.name })
    .from(activity)
    .leftJoin(users, eq(users.id, activity.userId))
    .where(and(eq(activity.projectId, projectId), opts.before ? lt(activity.createdAt, opts.before) : undefined))
    .orderBy(desc(activity.createdAt), desc(activity.id))
    .limit(opts.limit);
  return rows.map(({ userId, userName, ...r }) => ({ ...r, user: userId && userName !== null ? { id: userId, name: userName } : null }));
}
