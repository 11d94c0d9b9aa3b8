import { and, eq, gt, isNull } from 'drizzle-orm';
import type { Role } from '../../shared/roles';
import { ROLE_LABELS } from '../../shared/roles';
import type { Db } from '../db/client';
import { invites, memberships, teams, users } from '../db/schema';
import { newId, newToken, sha256Hex } from '../ids';
import { conflict, DomainError, forbidden, notFound } from './errors';
import { escapeHtml, type Mailer } from '../mail/mailer';
import { getTeam } from './teams';
import { errorSummary, log } from '../http/logger';

export const INVITE_DAYS = 7;

function publicInvite(row: typeof invites.$inferSelect) {
  return { id: row.id, email: row.email, role: row.role, createdAt: row.createdAt, expiresAt: row.expiresAt };
}

export async function createInvite(
  db: Db,
  mailer: Mailer,
  appOrigin: string,
  inviter: { id: string; name: string },
  teamId: string,
  input: { email: string; role: Role },
) {
  const [already] = await db
    .select({ userId: users.id })
    .from(memberships)
    .innerJoin(users, eq(users.id, memberships.userId))
    .where(and(eq(memberships.teamId, teamId), eq(users.email, input.email)));
  if (already) throw conflict('already_member', 'This person is already a member of the team.', { fields: { email: ['Already a member of this team'] } });

  const token = newToken();
  const row = await db.transaction(async (tx) => {
    // A new invite replaces an open one for the same address.
    await tx.delete(invites).where(and(eq(invites.teamId, teamId), eq(invites.email, input.email), isNull(invites.acceptedAt)));
    const [inserted] = await tx
      .insert(invites)
      .values({
        id: newId(),
        teamId,
        tokenHash: sha256Hex(token),
        email: input.email,
        role: input.role,
        invitedBy: inviter.id,
        expiresAt: new Date(Date.now() + INVITE_DAYS * 24 * 60 * 60 * 1000),
      })
      .returning();
    return inserted;
  });

  const [team] = await db.select({ name: teams.name }).from(teams).where(eq(teams.id, teamId));
  const link = `${appOrigin}/invites/${token}`;
  const roleLabel = ROLE_LABELS[input.role];
  const subject = `${inviter.name} invited you to ${team.name} on Bankwright`;
  const text =
    `${inviter.name} invited you to join the team "${team.name}" on Bankwright as ${roleLabel}.\n\n` +
    `Accept the invitation (sign in or create an account with ${input.email}):\n${link}\n\n` +
    `The link expires in ${INVITE_DAYS} days. If you did not expect this, ignore this message.\n`;
  const html =
    `<p>${escapeHtml(inviter.name)} invited you to join the team <strong>${escapeHtml(team.name)}</strong> on Bankwright as ${escapeHtml(roleLabel)}.</p>` +
    `<p><a href="${escapeHtml(link)}">Accept the invitation</a> (sign in or create an account with ${escapeHtml(input.email)}).</p>` +
    `<p>The link expires in ${INVITE_DAYS} days. If you did not expect this, ignore this message.</p>`;
  try {
    await mailer.sendMail({ to: input.email, subject, text, html, teamId });
  } catch (err) {
    await db.delete(invites).where(eq(invites.id, row.id));
    log().error({ event: 'mail.failed', mail: 'invite', err: errorSummary(err) }, 'invite not sent');
    throw new DomainError('upstream_failed', 'mail_failed', 'The invitation e-mail could not be sent, so no invite was created. Try again later.');
  }
  return publicInvite(row);
}

export async function revokeInvite(db: Db, teamId: string, inviteId: string) {
  const deleted = await db
    .delete(invites)
    .where(and(eq(invites.id, inviteId), eq(invites.teamId, teamId), isNull(invites.acceptedAt)))
    .returning({ id: invites.id });
  if (deleted.length === 0) throw notFound('No such invite.');
}

async function openInvite(db: Db, token: string) {
  const [row] = await db
    .select({ invite: invites, teamName: teams.name })
    .from(invites)
    .innerJoin(teams, eq(teams.id, invites.teamId))
    .where(and(eq(invites.tokenHash, sha256Hex(token)), isNull(invites.acceptedAt), gt(invites.expiresAt, new Date())));
  if (!row) throw notFound('This invitation is unknown, expired or already used.');
  return row;
}

export async function describeInvite(db: Db, token: string) {
  const { invite, teamName } = await openInvite(db, token);
  return { teamName, role: invite.role, email: invite.email, expiresAt: invite.expiresAt };
}

export async function acceptInvite(db: Db, user: { id: string; email: string }, token: string) {
  const { invite } = await openInvite(db, token);
  if (invite.email !== user.email)
    throw forbidden(`This invitation is for ${invite.email}. Sign in with that e-mail to accept it.`);
  await db.transaction(async (tx) => {
    const marked = await tx
      .update(invites)
      .set({ acceptedAt: new Date() })
      .where(and(eq(invites.id, invite.id), isNull(invites.acceptedAt)))
      .returning({ id: invites.id });
    if (marked.length === 0) throw notFound('This invitation is unknown, expired or already used.');
    // Already a member: keep the current role.
    await tx.insert(memberships).values({ teamId: invite.teamId, userId: user.id, role: invite.role }).onConflictDoNothing();
  });
  const team = await getTeam(db, user.id, invite.teamId);
  return { id: team.id, name: team.name, role: team.role, unitSystem: team.unitSystem };
}
