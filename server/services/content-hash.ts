/**
 * Content hash of a diagram document: SHA-256 (hex) of its canonical JSON — object keys sorted by UTF-16
 * code units (as RFC 8785 and JavaScript's sort do) at every level, no whitespace, numbers and strings as
 * JSON.stringify writes them. Equal documents give equal hashes whatever the key order they were sent or
 * stored in (jsonb reorders keys).
 */
import { createHash } from 'node:crypto';

export function canonicalJson(value: unknown): string {
  if (value === null || typeof value !== 'object') {
    // undefined (absent optional fields) is dropped by the object case; at top level it has no JSON.
    return JSON.stringify(value) ?? 'null';
  }
  if (Array.isArray(value)) return `[${value.map((v) => (v === undefined ? 'null' : canonicalJson(v))).join(',')}]`;
  const keys = Object.keys(value).filter((k) => (value as Record<string, unknown>)[k] !== undefined).sort();
  return `{${keys.map((k) => `${JSON.stringify(k)}:${canonicalJson((value as Record<string, unknown>)[k])}`).join(',')}}`;
}

export function contentHash(doc: unknown): string {
  return createHash('sha256').update(canonicalJson(doc)).digest('hex');
}
