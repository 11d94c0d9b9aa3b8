/**
 * When a change leaves nothing to solve (a structural error the analysis cannot work around, a short
 * drawn on purpose), the canvas keeps the last figures it had rather than blanking: greyed, marked
 * stale with the reason, which the status bar shows. The new result's findings, badges and marks (a
 * short's conductors with their current) are shown as they are; only the figures are carried.
 */
import type { CanvasSummary, EditorResults } from './types';

/** Why a canvas has no figures of its own, in one sentence. */
export function unsolvedReason(canvas: CanvasSummary): string {
  if (canvas.modeIssue) return canvas.modeIssue;
  const error = canvas.findings.find((f) => f.severity === 'error');
  return error ? error.message : 'The diagram could not be solved.';
}

/** `next` (unsolved) with the figures of `prev` (solved, or itself stale), greyed and marked stale. */
export function carryFigures(prev: CanvasSummary, next: CanvasSummary): CanvasSummary {
  const reason = unsolvedReason(next);
  // The last figures' marks of what they showed (a fault, what was left out) stay with them; a short's are the new result's.
  const marks: CanvasSummary['marks'] = {};
  for (const [id, m] of Object.entries(prev.marks)) if (m !== 'short') marks[id] = m;
  return {
    ...next,
    modeSummary: prev.modeSummary,
    marks: { ...marks, ...next.marks },
    batteries: { ...prev.batteries, ...next.batteries },
    cables: { ...prev.cables, ...next.cables },
    fuses: { ...prev.fuses, ...next.fuses },
    loads: { ...prev.loads, ...next.loads },
    imbalance_pct: prev.imbalance_pct,
    wiringLoss_W: prev.wiringLoss_W,
    internalLoss_W: prev.internalLoss_W,
    stale: { reason },
    modeIssue: `${reason.replace(/\.\s*$/, '')}. Greyed figures: from before this change.`,
  };
}

/**
 * The results to show for `next`: itself when it solved (or there is nothing earlier in the same mode to
 * keep), else with the figures of `prev` carried and greyed.
 */
export function withStale(prev: EditorResults | null, next: EditorResults): EditorResults {
  if (next.canvas.solved || !prev || prev.mode !== next.mode || prev.canvas.mode !== next.canvas.mode) return next;
  if (!prev.canvas.solved && !prev.canvas.stale) return next;
  return { ...next, canvas: carryFigures(prev.canvas, next.canvas) };
}
