/**
 * Where uploaded files' bytes live. The database holds what a file is (name, type, size, who, when);
 * a storage adapter holds its bytes under a key. Keys are made by the server (`newStorageKey`), never
 * from user input, and every adapter refuses a key of any other shape. docs/decisions/008-uploads-storage.md.
 */
import type { Readable } from 'node:stream';
import { randomBytes } from 'node:crypto';

export interface UploadStorage {
  /** "local" (a directory) or "s3" (a bucket), for log lines. */
  readonly kind: 'local' | 's3';
  /** Where the files live, for log lines (a directory, or bucket/prefix). */
  readonly location: string;
  /** Store `bytes` under `key`, replacing nothing: keys are fresh. */
  put(key: string, bytes: Uint8Array, contentType: string): Promise<void>;
  /** The bytes under `key` as a stream; throws StorageNotFoundError when there are none. */
  get(key: string): Promise<Readable>;
  /** Remove the bytes under `key`; a missing key is not an error. */
  delete(key: string): Promise<void>;
}

export class StorageNotFoundError extends Error {
  constructor(key: string) {
    super(`No stored file under key ${key}`);
  }
}

/** A storage key: 24 random bytes, base64url (32 characters). */
export function newStorageKey(): string {
  return randomBytes(24).toString('base64url');
}

const KEY = /^[A-Za-z0-9_-]{32}$/;

/** Throws unless `key` has the shape newStorageKey makes (no dots, no slashes: it cannot name a path). */
export function assertStorageKey(key: string): void {
  if (!KEY.test(key)) throw new Error('Invalid storage key');
}
