/**
 * Sizing as a checked transaction: every suggestion that would change the design is checked on its own
 * and all together (check.ts). When applying them all is not safe, the largest safe set found by adding
 * them one at a time in bank order is offered instead, with the reason each other one was refused.
 */
import type { DiagramDocument } from '../document/schema';
import { analyzeDiagram } from '../study/analyze';
import { applySizing } from './apply';
import { type DesignCheck, checkChange } from './check';
import { type BranchSizing, type SizingOptions, sizingChanges, suggestSizing } from './suggest';

export interface SizingPlan {
  /** Units whose suggestion would change the design (status ok). */
  pending: string[];
  /** Each pending suggestion applied alone. */
  each: Record<string, DesignCheck>;
  /** All pending suggestions applied together (null when none is pending). */
  all: DesignCheck | null;
  /** The units whose suggestions can be applied together safely. */
  safe: string[];
  /** That safe set's check (equal to `all` when everything is safe; null when the set is empty). */
  safeCheck: DesignCheck | null;
  /** Suggestions that are not applied, with why. */
  refused: { source: string; reasons: string[] }[];
}

export type SizingWithPlan =
  | { ok: true; branches: BranchSizing[]; plan: SizingPlan }
  | { ok: false; errors: { code: string; message: string; parts: string[] }[] };

export function planSizing(doc: DiagramDocument, branches: BranchSizing[]): SizingPlan {
  const base = analyzeDiagram(doc, { mode: 'load' });
  const pendingList = branches.filter((b) => sizingChanges(b, doc));
  const pending = pendingList.map((b) => b.source);
  const each: Record<string, DesignCheck> = {};
  for (const b of pendingList) each[b.source] = checkChange(doc, applySizing(doc, b), base);
  if (!pendingList.length) return { pending, each, all: null, safe: [], safeCheck: null, refused: conflicts(branches) };
  const all = checkChange(doc, applySizing(doc, pendingList), base);
  let safe: BranchSizing[] = [];
  let safeCheck: DesignCheck | null = null;
  const refused: { source: string; reasons: string[] }[] = conflicts(branches);
  if (all.safe) {
    safe = pendingList;
    safeCheck = all;
  } else {
    for (const b of pendingList) {
      const trial = [...safe, b];
      const check = checkChange(doc, applySizing(doc, trial), base);
      if (check.safe) {
        safe = trial;
        safeCheck = check;
      } else {
        refused.push({ source: b.source, reasons: each[b.source].safe ? check.reasons : each[b.source].reasons });
      }
    }
  }
  return { pending, each, all, safe: safe.map((b) => b.source), safeCheck, refused };
}

function conflicts(branches: BranchSizing[]): { source: string; reasons: string[] }[] {
  return branches.filter((b) => b.status === 'conflict').map((b) => ({ source: b.source, reasons: ['No fuse fits this battery: see the reasoning.'] }));
}

/** Suggestions and their plan in one call (the editor's worker and the command line). */
export function sizeDiagram(doc: DiagramDocument, options: SizingOptions = {}): SizingWithPlan {
  const r = suggestSizing(doc, options);
  if (!r.ok) return r;
  return { ok: true, branches: r.branches, plan: planSizing(doc, r.branches) };
}

/** The document with the safe set applied (unchanged when nothing is safe). */
export function applySafeSizing(doc: DiagramDocument, sized: Extract<SizingWithPlan, { ok: true }>): DiagramDocument {
  const safe = new Set(sized.plan.safe);
  const list = sized.branches.filter((b) => safe.has(b.source));
  return list.length ? applySizing(doc, list) : doc;
}
