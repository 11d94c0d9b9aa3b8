import { asc, eq, sql } from 'drizzle-orm';
import type { Db } from '../db/client';
import { memberships, teams, users } from '../db/schema';
import { newId } from '../ids';
import { hashPassword, verifyDummyPassword, verifyPassword } from '../auth/passwords';
import type { SignInLimiter } from '../auth/rate-limit';
import { conflict, DomainError } from './errors';
import type { Mailer } from '../mail/mailer';
import { signUpAttemptMail, welcomeMail } from '../mail/account-mail';
import type { SessionUser } from '../auth/sessions';
import type { Role } from '../../shared/roles';
import { errorSummary, log } from '../http/logger';

export const INVALID_CREDENTIALS_MESSAGE = 'E-mail or password is incorrect.';

export function publicUser(u: SessionUser) {
  return { id: u.id, email: u.email, name: u.name, createdAt: u.createdAt };
}

function isUniqueViolation(err: unknown): boolean {
  // PostgreSQL unique_violation; drizzle wraps driver errors, so look at the cause too.
  const e = err as { code?: string; cause?: { code?: string } };
  return e?.code === '23505' || e?.cause?.code === '23505';
}

/**
 * Sign-up. The answer is the same for a new and a known e-mail (OWASP ASVS 5.0 6.3.8): both hash the
 * password, send one message (a welcome, or "someone tried to sign up with this address" to the owner of
 * the known address) and return a user of the same shape; for a known address that user is a decoy
 * (a fresh id that belongs to no account) and nothing is stored but the message. `created` tells the
 * route whether to start a real session.
 */
export async function signUp(
  db: Db,
  mailer: Mailer,
  appOrigin: string,
  input: { email: string; password: string; name: string },
): Promise<{ user: SessionUser; created: boolean }> {
  const [existing] = await db.select({ id: users.id }).from(users).where(eq(users.email, input.email));
  const passwordHash = await hashPassword(input.password);
  let row: SessionUser | undefined;
  if (!existing) {
    try {
      [row] = await db
        .insert(users)
        .values({ id: newId(), email: input.email, name: input.name, passwordHash })
        .returning({ id: users.id, email: users.email, name: users.name, createdAt: users.createdAt });
    } catch (err) {
      // Taken between the lookup and the insert: answered like any known address.
      if (!isUniqueViolation(err)) throw err;
    }
  }
  const mail = row ? welcomeMail(input.email, input.name, appOrigin) : signUpAttemptMail(input.email, appOrigin);
  try {
    await mailer.sendMail(mail);
  } catch (err) {
    // The account stands either way; a lost message must not turn into a different answer.
    log().error({ event: 'mail.failed', mail: 'sign-up', err: errorSummary(err) }, 'sign-up message not sent');
  }
  if (row) return { user: row, created: true };
  return { user: { id: newId(), email: input.email, name: input.name, createdAt: new Date() }, created: false };
}

export function tooManySignUps(retryAfter: number): DomainError {
  return new DomainError(
    'rate_limited',
    'too_many_sign_ups',
    `Too many sign-ups from this address. Try again in ${retryAfter} seconds.`,
    { retryAfterSeconds: retryAfter },
    retryAfter,
  );
}

function tooManyAttempts(retryAfter: number): DomainError {
  return new DomainError(
    'rate_limited',
    'too_many_attempts',
    `Too many failed sign-in attempts. Try again in ${retryAfter} seconds.`,
    { retryAfterSeconds: retryAfter },
    retryAfter,
  );
}

/**
 * Checks e-mail and password under the sign-in limiter (server/auth/rate-limit.ts, OWASP ASVS 5.0 6.3.1).
 * Unknown e-mail and wrong password give the same 401 and take the same time (a dummy hash is verified
 * for unknown e-mails). `deviceCookie` is the browser's device cookie: when it was signed for this
 * account, the attempt counts on that device and not on the address or the account, so a stranger's
 * guesses do not lock the owner's browser out. Routes that re-check the password of a signed-in user
 * pass none. `trusted` says which counters the attempt used.
 */
export async function checkCredentials(
  db: Db,
  limiter: SignInLimiter,
  input: { email: string; password: string },
  ip: string,
  deviceCookie?: string,
): Promise<SessionUser & { trusted: boolean }> {
  const [row] = await db.select().from(users).where(eq(users.email, input.email));
  const deviceId = row && deviceCookie ? await limiter.verifyDevice(deviceCookie, row.id) : null;
  const gate = await limiter.check({ email: input.email, ip, deviceId });
  if (gate.retryAfterSeconds > 0) throw tooManyAttempts(gate.retryAfterSeconds);
  const ok = row ? await verifyPassword(row.passwordHash, input.password) : await verifyDummyPassword(input.password);
  if (!row || !ok) {
    await gate.fail();
    throw new DomainError('unauthenticated', 'invalid_credentials', INVALID_CREDENTIALS_MESSAGE);
  }
  await gate.succeed();
  return { id: row.id, email: row.email, name: row.name, createdAt: row.createdAt, trusted: gate.trusted };
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
