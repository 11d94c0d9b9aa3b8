/** A user's own preferences, stored server-side so every device shows the same: for now, their unit system. */
import { eq } from 'drizzle-orm';
import type { DbOrTx } from '../db/client';
import { users } from '../db/schema';

export type UnitSystem = 'metric' | 'us';

export interface Preferences {
  /** The unit system for this user's screens; null follows each team's setting. */
  unitSystem: UnitSystem | null;
}

export async function getPreferences(db: DbOrTx, userId: string): Promise<Preferences> {
  const [row] = await db.select({ unitSystem: users.unitSystem }).from(users).where(eq(users.id, userId));
  return { unitSystem: row?.unitSystem ?? null };
}

export async function setPreferences(db: DbOrTx, userId: string, input: Preferences): Promise<Preferences> {
  await db.update(users).set({ unitSystem: input.unitSystem }).where(eq(users.id, userId));
  return getPreferences(db, userId);
}
