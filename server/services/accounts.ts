import { asc, eq, sql } from 'drizzle-orm';
import type { Db } from '../db/client';
import { memberships, teams, users } from '../db/schema';
import { newId } from '../ids';
import { hashPassword, verifyDummyPassword, verifyPassword } from '../auth/passwords';
import type { SignInLimiter } from '../auth/rate-limit';
import { ApiError, conflict } from '../http/errors';
import type { SessionUser } from '../auth/sessions';
import type { Role } from '../../shared/roles';

export const INVALID_CREDENTIALS_MESSAGE = 'E-mail or password is incorrect.';

export function publicUser(u: SessionUser) {
  return { id: u.id, email: u.email, name: u.name, createdAt: u.createdAt };
}

function isUniqueViolation(err: unknown): boolean {
  // PostgreSQL unique_violation; drizzle wraps driver errors, so look at the cause too.
  const e = err as { code?: string; cause?: { code?: string } };
  return e?.code === '23505' || e?.cause?.code === '23505';
}

export async function signUp(db: Db, input: { email: string; password: string; name: string }): Promise<SessionUser> {
  const [existing] = await db.select({ id: users.id }).from(users).where(eq(users.email, input.email));
  if (existing) throw conflict('email_taken', 'An account with this e-mail already exists.', { fields: { email: ['An account with this e-mail already exists'] } });
  const passwordHash = await hashPassword(input.password);
  try {
    const [row] = await db
      .insert(users)
      .values({ id: newId(), email: input.email, name: input.name, passwordHash })
      .returning({ id: users.id, email: users.email, name: users.name, createdAt: users.createdAt });
    return row;
  } catch (err) {
    if (isUniqueViolation(err)) throw conflict('email_taken', 'An account with this e-mail already exists.', { fields: { email: ['An account with this e-mail already exists'] } });
    throw err;
  }
}

function tooManyAttempts(retryAfter: number): ApiError {
  return new ApiError(
    429,
    'too_many_attempts',
    `Too many failed sign-in attempts. Try again in ${retryAfter} seconds.`,
    { retryAfterSeconds: retryAfter },
    { 'Retry-After': String(retryAfter) },
  );
}

/**
 * Checks e-mail and password under the brute-force limiter. Unknown e-mail and wrong password give
 * the same 401 and take the same time (a dummy hash is verified for unknown e-mails).
 */
export async function checkCredentials(
  db: Db,
  limiter: SignInLimiter,
  input: { email: string; password: string },
  ip: string,
): Promise<SessionUser> {
  const wait = limiter.retryAfterSeconds(input.email, ip);
  if (wait > 0) throw tooManyAttempts(wait);
  const [row] = await db.select().from(users).where(eq(users.email, input.email));
  const ok = row ? await verifyPassword(row.passwordHash, input.password) : await verifyDummyPassword(input.password);
  if (!row || !ok) {
    limiter.recordFailure(input.email, ip);
    throw new ApiError(401, 'invalid_credentials', INVALID_CREDENTIALS_MESSAGE);
  }
  limiter.recordSuccess(input.email);
  return { id: row.id, email: row.email, name: row.name, createdAt: row.createdAt };
}

export async function updateName(db: Db, userId: string, name: string | undefined): Promise<SessionUser> {
  if (name !== undefined) await db.update(users).set({ name }).where(eq(users.id, userId));
  const [row] = await db
    .select({ id: users.id, email: users.email, name: users.name, createdAt: users.createdAt })
    .from(users)
    .where(eq(users.id, userId));
  return row;
}

const EMAIL_TAKEN = () => conflict('email_taken', 'An account with this e-mail already exists.', { fields: { email: ['An account with this e-mail already exists'] } });

/** Changes the account's e-mail (the caller has checked the current password). 409 email_taken when another account has it. */
export async function changeEmail(db: Db, userId: string, email: string): Promise<SessionUser> {
  const [other] = await db.select({ id: users.id }).from(users).where(eq(users.email, email));
  if (other && other.id !== userId) throw EMAIL_TAKEN();
  if (!other) {
    try {
      await db.update(users).set({ email }).where(eq(users.id, userId));
    } catch (err) {
      if (isUniqueViolation(err)) throw EMAIL_TAKEN();
      throw err;
    }
  }
  return updateName(db, userId, undefined);
}

export async function setPassword(db: Db, userId: string, password: string): Promise<void> {
  const passwordHash = await hashPassword(password);
  await db.update(users).set({ passwordHash }).where(eq(users.id, userId));
}

export async function userTeams(db: Db, userId: string) {
  return db
    .select({ id: teams.id, name: teams.name, role: sql<Role>`${memberships.role}`, unitSystem: teams.unitSystem })
    .from(memberships)
    .innerJoin(teams, eq(teams.id, memberships.teamId))
    .where(eq(memberships.userId, userId))
    .orderBy(asc(teams.name), asc(teams.id));
}
