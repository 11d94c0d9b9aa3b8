/** Read an untrusted diagram document: migrate older versions, validate, report errors with JSON paths. */
import type { z } from 'zod';
import { DIAGRAM_FORMAT_VERSION, type DiagramDocument, diagramSchema } from '../electrical/document/schema';

export interface DiagramIssue {
  /** JSON path of the offending value, e.g. "$.parts[3].props.capacity_Ah". */
  path: string;
  message: string;
}

export type ParseDiagramResult =
  | { ok: true; doc: DiagramDocument; migratedFrom?: number }
  | { ok: false; errors: DiagramIssue[]; totalErrors: number };

/** How many issues `parseDiagram` reports at most. */
export const MAX_REPORTED_ISSUES = 20;

export function jsonPath(path: readonly PropertyKey[]): string {
  let s = '$';
  for (const k of path) {
    if (typeof k === 'number') s += `[${k}]`;
    else if (typeof k === 'string' && /^[A-Za-z_][A-Za-z0-9_]*$/.test(k)) s += `.${k}`;
    else s += `[${JSON.stringify(String(k))}]`;
  }
  return s;
}

export type MigrateResult = { ok: true; doc: unknown; from: number } | { ok: false; errors: DiagramIssue[] };

/**
 * Bring a document of a known older format version up to the current one.
 *
 * Only version 1 exists, so this checks the version and passes v1 through. When a v2 is introduced,
 * add a step `v1 → v2` here (a pure function on the plain JSON, e.g. renaming a field or filling a new
 * required setting with the value v1 implied), apply steps in order until the current version, and
 * keep every step forever so old files and stored revisions keep opening.
 */
export function migrateDiagram(raw: unknown): MigrateResult {
  if (typeof raw !== 'object' || raw === null || Array.isArray(raw)) {
    return { ok: false, errors: [{ path: '$', message: 'A diagram document is a JSON object' }] };
  }
  const version = (raw as { formatVersion?: unknown }).formatVersion;
  if (typeof version !== 'number' || !Number.isInteger(version) || version < 1) {
    return { ok: false, errors: [{ path: '$.formatVersion', message: 'formatVersion is missing or not a positive whole number' }] };
  }
  if (version > DIAGRAM_FORMAT_VERSION) {
    return {
      ok: false,
      errors: [{ path: '$.formatVersion', message: `This file is format version ${version}; this version of the app reads up to ${DIAGRAM_FORMAT_VERSION}` }],
    };
  }
  const doc: unknown = raw;
  // Future steps: if (version === 1) doc = migrateV1toV2(doc); …
  return { ok: true, doc, from: version };
}

/** Parse a diagram document from a JSON string or an already-parsed value. */
export function parseDiagram(input: unknown): ParseDiagramResult {
  let raw = input;
  if (typeof input === 'string') {
    try {
      raw = JSON.parse(input);
    } catch (e) {
      return { ok: false, errors: [{ path: '$', message: `Not valid JSON: ${(e as Error).message}` }], totalErrors: 1 };
    }
  }
  const migrated = migrateDiagram(raw);
  if (!migrated.ok) return { ok: false, errors: migrated.errors, totalErrors: migrated.errors.length };
  const result = diagramSchema.safeParse(migrated.doc);
  if (!result.success) {
    const issues = flattenIssues(result.error.issues);
    return { ok: false, errors: issues.slice(0, MAX_REPORTED_ISSUES), totalErrors: issues.length };
  }
  return { ok: true, doc: result.data, ...(migrated.from !== DIAGRAM_FORMAT_VERSION ? { migratedFrom: migrated.from } : {}) };
}

function flattenIssues(issues: readonly z.core.$ZodIssue[], prefix: readonly PropertyKey[] = []): DiagramIssue[] {
  const out: DiagramIssue[] = [];
  for (const issue of issues) {
    const path = [...prefix, ...issue.path];
    out.push({ path: jsonPath(path), message: issue.message });
  }
  return out;
}
