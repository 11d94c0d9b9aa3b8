import { createHash, randomBytes } from 'node:crypto';

/** A random id for table rows: 16 bytes, base64url (22 characters). */
export function newId(): string {
  return randomBytes(16).toString('base64url');
}

/** A secret token (invite links): 32 bytes, base64url. */
export function newToken(): string {
  return randomBytes(32).toString('base64url');
}

export function sha256Hex(value: string): string {
  return createHash('sha256').update(value).digest('hex');
}
