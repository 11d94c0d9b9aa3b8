/** Password hashing: argon2id, m=19456 KiB, t=2, p=1 (OWASP Password Storage Cheat Sheet). */
import { hash, verify } from '@node-rs/argon2';

const ARGON2ID = 2; // Algorithm.Argon2id (a const enum in @node-rs/argon2's types)
const OPTIONS = { algorithm: ARGON2ID, memoryCost: 19456, timeCost: 2, parallelism: 1 } as const;

export function hashPassword(password: string): Promise<string> {
  return hash(password, OPTIONS);
}

export async function verifyPassword(passwordHash: string, password: string): Promise<boolean> {
  try {
    return await verify(passwordHash, password);
  } catch {
    return false; // malformed hash: never a match
  }
}

let dummyHash: Promise<string> | undefined;

/**
 * Spend the same time as a real verification, for sign-ins with an unknown e-mail, so the response
 * time does not tell whether an account exists. Always false.
 */
export async function verifyDummyPassword(password: string): Promise<false> {
  dummyHash ??= hashPassword('bankwright-timing-equaliser');
  await verifyPassword(await dummyHash, password);
  return false;
}
