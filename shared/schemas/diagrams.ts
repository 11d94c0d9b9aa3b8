/** API bodies for diagrams, their working copy and their revisions. The document itself is shared/electrical/document/schema.ts. */
import { z } from 'zod';
import { diagramSchema } from '../electrical/document/schema';

const name = z.string().trim().min(1, 'Diagram name is required').max(120, 'Diagram name is too long');
const description = z.string().trim().max(2000, 'Description is too long');
const message = z.string().trim().max(500, 'Message is too long');

export const createDiagramSchema = z.object({
  name,
  description: description.default(''),
  /** The diagram document; an empty diagram when missing. */
  content: diagramSchema.optional(),
});
export type CreateDiagramInput = z.input<typeof createDiagramSchema>;

export const updateDiagramSchema = z
  .object({ name, description })
  .partial()
  .refine((v) => Object.keys(v).length > 0, { message: 'Nothing to update' });
export type UpdateDiagramInput = z.input<typeof updateDiagramSchema>;

export const workingCopySchema = z.object({
  content: diagramSchema,
  /** The workingCopyVersion this edit started from. */
  baseVersion: z.int('baseVersion must be a whole number').min(1, 'baseVersion must be at least 1'),
});
export type WorkingCopyInput = z.input<typeof workingCopySchema>;

export const saveRevisionSchema = z.object({
  /** The number of the latest revision this edit started from; null for a diagram's first revision. */
  baseRevision: z.int('baseRevision must be a whole number or null').min(1, 'baseRevision must be at least 1').nullable(),
  message: message.default(''),
  content: diagramSchema,
});
export type SaveRevisionInput = z.input<typeof saveRevisionSchema>;

export const restoreRevisionSchema = z.object({ message: message.optional() });
export type RestoreRevisionInput = z.input<typeof restoreRevisionSchema>;

export const duplicateDiagramSchema = z.object({
  name,
  description: description.optional(),
  /** Copy this revision; without it, the latest revision (or the working copy when there is none). */
  revision: z.int('revision must be a whole number').min(1, 'revision must be at least 1').optional(),
});
export type DuplicateDiagramInput = z.input<typeof duplicateDiagramSchema>;

/**
 * POST /api/diagrams/:id/move and /copy: the project of the same team to move the diagram to, or to put
 * the copy in. A copy is named "<name> (copy)" unless `name` is given.
 */
export const moveDiagramSchema = z.object({
  projectId: z.string({ error: 'projectId is required' }).trim().min(1, 'projectId is required').max(64, 'projectId is too long'),
});
export type MoveDiagramInput = z.input<typeof moveDiagramSchema>;

export const copyDiagramSchema = moveDiagramSchema.extend({ name: name.optional() });
export type CopyDiagramInput = z.input<typeof copyDiagramSchema>;

/** The name of a copy: "<name> (copy)", shortened so it stays within the 120-character limit. */
export function copyName(source: string): string {
  const suffix = ' (copy)';
  return `${source.trim().slice(0, 120 - suffix.length).trimEnd()}${suffix}`;
}

export const REVISION_STATES = ['draft', 'in_review', 'changes_requested', 'approved'] as const;
export type RevisionState = (typeof REVISION_STATES)[number];

export const REVISION_STATE_LABELS: Record<RevisionState, string> = {
  draft: 'Draft',
  in_review: 'In review',
  changes_requested: 'Changes requested',
  approved: 'Approved',
};

export const CHECK_MODES = ['load', 'charge', 'equalize', 'fault', 'discharge'] as const;
export type CheckMode = (typeof CHECK_MODES)[number];

const checkFields = {
  mode: z.enum(CHECK_MODES, { error: `mode must be one of ${CHECK_MODES.join(', ')}` }).default('load'),
  fault: z
    .object({
      kind: z.enum(['battery', 'cable'], { error: 'fault.kind must be battery or cable' }),
      // A part or cable id, or a series-string member "<stringId>/b<k>".
      id: z.string().min(1, 'fault.id is required').max(140, 'fault.id is too long').regex(/^[A-Za-z0-9_/-]+$/, 'fault.id names a battery, string member or cable'),
    })
    .optional(),
};
const faultNeedsFaultMode = (v: { mode: CheckMode; fault?: unknown }) => v.fault === undefined || v.mode === 'fault';
const FAULT_MODE_ONLY = { message: 'fault is only allowed with mode "fault"', path: ['fault'] };

/**
 * POST /api/diagrams/:id/check: analyse `content` (a designer checking unsaved content), or without it
 * the diagram's working copy. In fault mode, `fault` picks one case to solve in full.
 */
export const checkDiagramSchema = z.object({ ...checkFields, content: diagramSchema.optional() }).refine(faultNeedsFaultMode, FAULT_MODE_ONLY);
export type CheckDiagramInput = z.input<typeof checkDiagramSchema>;

/** The same body with `content` left unparsed: the server validates it with the diagram schema in a worker thread. */
export const checkOptionsSchema = z.object({ ...checkFields, content: z.unknown().optional() }).refine(faultNeedsFaultMode, FAULT_MODE_ONLY);
