/**
 * # The annotation layer
 *
 * Marks drawn over a diagram for a crew briefing. They never change the electrical model: the core
 * (compile, solve, rules, bill of materials) ignores `annotations` entirely.
 *
 * The document schema keeps `annotations` open (`{ id, kind, … }`, see schema.ts) so that files from a
 * later version with new kinds still open; this module is the strict schema of the kinds this version
 * draws and edits:
 *
 * | kind        | fields                                   | drawn as                                  |
 * |-------------|------------------------------------------|-------------------------------------------|
 * | `callout`   | `partId`, `text`                         | a text bubble with a leader to the part   |
 * | `step`      | `number` (1–999), `text`, `partIds`      | a numbered disc on each part; a step list |
 * | `note`      | `position: { x, y }`, `text`             | a free text box at a canvas position      |
 * | `highlight` | `partIds` (≥ 1), `label?`                | a dashed outline around the parts' box    |
 *
 * Entries of any other kind are kept as they are and not drawn.
 */
import { z } from 'zod';
import { jsonPath, type DiagramIssue } from './parse';
import { DIAGRAM_LIMITS, idSchema, positionSchema, type DiagramAnnotation } from '../electrical/document/schema';

export const ANNOTATION_LIMITS = {
  maxTextLength: 500,
  maxLabelLength: 80,
  maxPartsPerAnnotation: 200,
  maxStepNumber: 999,
} as const;

const text = z
  .string()
  .trim()
  .min(1, 'Text is required')
  .max(ANNOTATION_LIMITS.maxTextLength, `Text is at most ${ANNOTATION_LIMITS.maxTextLength} characters`);
const partIds = z.array(idSchema).max(ANNOTATION_LIMITS.maxPartsPerAnnotation);

export const calloutSchema = z.object({ id: idSchema, kind: z.literal('callout'), partId: idSchema, text });
export const stepSchema = z.object({
  id: idSchema,
  kind: z.literal('step'),
  number: z.int('A step number is a whole number').min(1).max(ANNOTATION_LIMITS.maxStepNumber),
  text,
  partIds,
});
export const noteSchema = z.object({ id: idSchema, kind: z.literal('note'), position: positionSchema, text });
export const highlightSchema = z.object({
  id: idSchema,
  kind: z.literal('highlight'),
  partIds: partIds.min(1, 'A highlight surrounds at least one part'),
  label: z.string().trim().max(ANNOTATION_LIMITS.maxLabelLength).optional(),
});

export const ANNOTATION_KINDS = ['callout', 'step', 'note', 'highlight'] as const;
export type AnnotationKind = (typeof ANNOTATION_KINDS)[number];

export const knownAnnotationSchema = z.discriminatedUnion('kind', [calloutSchema, stepSchema, noteSchema, highlightSchema]);
export type Annotation = z.infer<typeof knownAnnotationSchema>;
export type Callout = z.infer<typeof calloutSchema>;
export type Step = z.infer<typeof stepSchema>;
export type Note = z.infer<typeof noteSchema>;
export type Highlight = z.infer<typeof highlightSchema>;

export const ANNOTATION_KIND_NAMES: Record<AnnotationKind, string> = {
  callout: 'Callout',
  step: 'Installation step',
  note: 'Note',
  highlight: 'Highlight',
};

export const isKnownKind = (kind: string): kind is AnnotationKind => (ANNOTATION_KINDS as readonly string[]).includes(kind);

export interface ParsedAnnotations {
  /** Valid entries of the known kinds, in document order. */
  annotations: Annotation[];
  /** Entries of kinds this version does not know (kept, not drawn). */
  other: DiagramAnnotation[];
  /** Problems, with JSON paths under `$.annotations`. */
  issues: DiagramIssue[];
}

/** Referenced parts each annotation kind names. */
export function referencedParts(a: Annotation): string[] {
  switch (a.kind) {
    case 'callout':
      return [a.partId];
    case 'step':
    case 'highlight':
      return a.partIds;
    case 'note':
      return [];
  }
}

/**
 * Validate the annotation entries of a document against the kinds above. With `partIdsInDoc`, a
 * reference to a part that is not in the document is an issue too.
 */
export function parseAnnotations(entries: readonly unknown[], partIdsInDoc?: ReadonlySet<string>): ParsedAnnotations {
  const out: ParsedAnnotations = { annotations: [], other: [], issues: [] };
  const steps = new Map<number, number>();
  entries.forEach((entry, i) => {
    const kind = (entry as { kind?: unknown } | null)?.kind;
    if (typeof kind === 'string' && !isKnownKind(kind)) {
      out.other.push(entry as DiagramAnnotation);
      return;
    }
    const r = knownAnnotationSchema.safeParse(entry);
    if (!r.success) {
      for (const issue of r.error.issues) out.issues.push({ path: jsonPath(['annotations', i, ...issue.path]), message: issue.message });
      return;
    }
    const a = r.data;
    if (partIdsInDoc) {
      const refs = referencedParts(a);
      refs.forEach((id, j) => {
        if (partIdsInDoc.has(id)) return;
        const path = a.kind === 'callout' ? ['annotations', i, 'partId'] : ['annotations', i, 'partIds', j];
        out.issues.push({ path: jsonPath(path), message: `No part with id "${id}"` });
      });
    }
    if (a.kind === 'step') {
      const first = steps.get(a.number);
      if (first !== undefined) {
        out.issues.push({ path: jsonPath(['annotations', i, 'number']), message: `Step ${a.number} is numbered twice (also $.annotations[${first}])` });
      } else steps.set(a.number, i);
    }
    out.annotations.push(a);
  });
  return out;
}

/** The known annotations of a document, skipping entries that do not validate (for drawing). */
export function drawableAnnotations(entries: readonly unknown[]): Annotation[] {
  const out: Annotation[] = [];
  for (const e of entries) {
    const r = knownAnnotationSchema.safeParse(e);
    if (r.success) out.push(r.data);
  }
  return out;
}

/**
 * Annotations with references to removed parts dropped: a callout on a removed part goes, steps and
 * highlights keep the parts that remain (a highlight with none left goes). Entries of unknown kinds
 * and entries that do not validate are kept as they are. Returns the same array when nothing changed.
 */
export function pruneDanglingReferences<T extends { annotations: DiagramAnnotation[]; parts: { id: string }[] }>(doc: T): DiagramAnnotation[] {
  const ids = new Set(doc.parts.map((p) => p.id));
  let changed = false;
  const out: DiagramAnnotation[] = [];
  for (const entry of doc.annotations) {
    const r = knownAnnotationSchema.safeParse(entry);
    if (!r.success) {
      out.push(entry);
      continue;
    }
    const a = r.data;
    if (a.kind === 'callout' && !ids.has(a.partId)) {
      changed = true;
      continue;
    }
    if (a.kind === 'step' || a.kind === 'highlight') {
      const kept = a.partIds.filter((id) => ids.has(id));
      if (kept.length !== a.partIds.length) {
        changed = true;
        if (a.kind === 'highlight' && kept.length === 0) continue;
        out.push({ ...entry, partIds: kept });
        continue;
      }
    }
    out.push(entry);
  }
  return changed ? out : doc.annotations;
}

/** The next free step number (one more than the highest). */
export function nextStepNumber(annotations: readonly Annotation[]): number {
  let max = 0;
  for (const a of annotations) if (a.kind === 'step') max = Math.max(max, a.number);
  return Math.min(max + 1, ANNOTATION_LIMITS.maxStepNumber);
}

/** Steps in number order. */
export function stepsInOrder(annotations: readonly Annotation[]): Step[] {
  return annotations.filter((a): a is Step => a.kind === 'step').sort((a, b) => a.number - b.number);
}

/** An id "<prefix><n>" not used by any part, cable or annotation of the document. */
export function freshAnnotationId(doc: { parts: { id: string }[]; cables: { id: string }[]; annotations: { id: string }[] }, prefix: string): string {
  const used = new Set([...doc.parts.map((p) => p.id), ...doc.cables.map((c) => c.id), ...doc.annotations.map((a) => a.id)]);
  let n = 1;
  while (used.has(`${prefix}${n}`)) n++;
  return `${prefix}${n}`;
}

/** The annotations array schema with the document's limit (for an annotations-only request body). */
export const annotationsBodySchema = z.object({
  annotations: z.array(z.looseObject({ id: idSchema, kind: z.string().min(1).max(40) })).max(DIAGRAM_LIMITS.maxAnnotations),
  baseVersion: z.int().min(1),
});
