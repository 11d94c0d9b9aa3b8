import { and, asc, count, eq, gt, isNull, ne, sql } from 'drizzle-orm';
import type { Role } from '../../shared/roles';
import { can } from '../../shared/roles';
import type { Db, DbOrTx } from '../db/client';
import { invites, memberships, projects, teams, uploads, users } from '../db/schema';
import { newId } from '../ids';
import { conflict, notFound } from './errors';

type UnitSystem = 'metric' | 'us';

// Table-qualified by hand: drizzle may leave columns unqualified, which would bind to m.
const memberCount = sql<number>`(select count(*)::int from "memberships" m where m.team_id = "teams"."id")`;

export async function listTeams(db: Db, userId: string) {
  return db
    .select({ id: teams.id, name: teams.name, role: sql<Role>`${memberships.role}`, unitSystem: teams.unitSystem, memberCount })
    .from(memberships)
    .innerJoin(teams, eq(teams.id, memberships.teamId))
    .where(eq(memberships.userId, userId))
    .orderBy(asc(teams.name), asc(teams.id));
}

export async function getTeam(db: DbOrTx, userId: string, teamId: string) {
  const [row] = await db
    .select({ id: teams.id, name: teams.name, role: sql<Role>`${memberships.role}`, unitSystem: teams.unitSystem, memberCount })
    .from(memberships)
    .innerJoin(teams, eq(teams.id, memberships.teamId))
    .where(and(eq(memberships.userId, userId), eq(teams.id, teamId)));
  if (!row) throw notFound('No such team.');
  return row;
}

export async function createTeam(db: Db, userId: string, input: { name: string; unitSystem: UnitSystem }) {
  const id = newId();
  await db.transaction(async (tx) => {
    await tx.insert(teams).values({ id, name: input.name, unitSystem: input.unitSystem });
    await tx.insert(memberships).values({ teamId: id, userId, role: 'owner' });
  });
  return { id, name: input.name, role: 'owner' as Role, unitSystem: input.unitSystem };
}

export async function updateTeam(db: Db, userId: string, teamId: string, input: { name?: string; unitSystem?: UnitSystem }) {
  if (input.name !== undefined || input.unitSystem !== undefined) {
    await db
      .update(teams)
      .set({ ...input, updatedAt: new Date() })
      .where(eq(teams.id, teamId));
  }
  return getTeam(db, userId, teamId);
}

/** Deletes the team (projects, uploads, library cascade); returns the storage keys of its uploads to remove. */
export async function deleteTeam(db: Db, teamId: string): Promise<string[]> {
  return db.transaction(async (tx) => {
    const keys = (
      await tx.select({ key: uploads.key }).from(uploads).innerJoin(projects, eq(projects.id, uploads.projectId)).where(eq(projects.teamId, teamId))
    ).map((r) => r.key);
    await tx.delete(teams).where(eq(teams.id, teamId));
    return keys;
  });
}

export async function listMembers(db: Db, teamId: string, role: Role) {
  const members = await db
    .select({ userId: users.id, email: users.email, name: users.name, role: memberships.role, joinedAt: memberships.createdAt })
    .from(memberships)
    .innerJoin(users, eq(users.id, memberships.userId))
    .where(eq(memberships.teamId, teamId))
    .orderBy(asc(users.name), asc(users.email));
  const pending = can(role, 'team.manage')
    ? await db
        .select({ id: invites.id, email: invites.email, role: invites.role, createdAt: invites.createdAt, expiresAt: invites.expiresAt })
        .from(invites)
        .where(and(eq(invites.teamId, teamId), isNull(invites.acceptedAt), gt(invites.expiresAt, new Date())))
        .orderBy(asc(invites.createdAt))
    : [];
  return { members, invites: pending };
}

/** Lock the team row so concurrent role changes cannot both remove "the other" owner. */
async function lockTeam(tx: DbOrTx, teamId: string) {
  await tx.select({ id: teams.id }).from(teams).where(eq(teams.id, teamId)).for('update');
}

async function otherOwnerCount(tx: DbOrTx, teamId: string, userId: string): Promise<number> {
  const [row] = await tx
    .select({ n: count() })
    .from(memberships)
    .where(and(eq(memberships.teamId, teamId), eq(memberships.role, 'owner'), ne(memberships.userId, userId)));
  return row.n;
}

const lastOwner = () =>
  conflict('last_owner', 'A team needs at least one owner. Make another member an owner first.');

export async function changeRole(db: Db, teamId: string, userId: string, role: Role) {
  return db.transaction(async (tx) => {
    await lockTeam(tx, teamId);
    const [member] = await tx
      .select({ role: memberships.role })
      .from(memberships)
      .where(and(eq(memberships.teamId, teamId), eq(memberships.userId, userId)));
    if (!member) throw notFound('No such member.');
    if (member.role === 'owner' && role !== 'owner' && (await otherOwnerCount(tx, teamId, userId)) === 0) throw lastOwner();
    await tx.update(memberships).set({ role }).where(and(eq(memberships.teamId, teamId), eq(memberships.userId, userId)));
    const [row] = await tx
      .select({ userId: users.id, email: users.email, name: users.name, role: memberships.role, joinedAt: memberships.createdAt })
      .from(memberships)
      .innerJoin(users, eq(users.id, memberships.userId))
      .where(and(eq(memberships.teamId, teamId), eq(memberships.userId, userId)));
    return row;
  });
}

export async function removeMember(db: Db, teamId: string, userId: string) {
  await db.transaction(async (tx) => {
    await lockTeam(tx, teamId);
    const [member] = await tx
      .select({ role: memberships.role })
      .from(memberships)
      .where(and(eq(memberships.teamId, teamId), eq(memberships.userId, userId)));
    if (!member) throw notFound('No such member.');
    if (member.role === 'owner' && (await otherOwnerCount(tx, teamId, userId)) === 0) throw lastOwner();
    await tx.delete(memberships).where(and(eq(memberships.teamId, teamId), eq(memberships.userId, userId)));
  });
}
