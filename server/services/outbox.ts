import { desc, eq } from 'drizzle-orm';
import type { Db } from '../db/client';
import { mailOutbox } from '../db/schema';

export async function listOutbox(db: Db, teamId: string) {
  return db
    .select({ id: mailOutbox.id, to: mailOutbox.to, subject: mailOutbox.subject, text: mailOutbox.text, html: mailOutbox.html, createdAt: mailOutbox.createdAt })
    .from(mailOutbox)
    .where(eq(mailOutbox.teamId, teamId))
    .orderBy(desc(mailOutbox.createdAt), desc(mailOutbox.id))
    .limit(200);
}
