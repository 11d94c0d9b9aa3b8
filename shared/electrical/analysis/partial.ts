/**
 * The analysis context around the structural errors that need not stop the figures.
 *
 * - Parts not connected (a floating part, an open terminal): the connected remainder is solved
 *   (compile/remainder.ts) and the loose parts keep their errors, so the checks still fail while the
 *   figures of everything else show.
 * - A short drawn in the diagram (shorts.ts): nothing is solved as designed, but the result names the
 *   shorting conductors with the prospective current through them.
 * Any other structural error (no source, reversed strings of unequal voltage, a separate circuit, an
 * invalid value) stops the analysis as before.
 */
import type { DiagramDocument } from '../document/schema';
import { type CompileErrorCode, LOOSE_CODES, SHORT_CODES } from '../compile/compile';
import { type ConnectedRemainder, connectedRemainder } from '../compile/remainder';
import { type AnalysisContext, buildContext } from './context';
import { itemName, nameList, studyShorts } from './shorts';
import type { AnalysisIssue, DrawnShort, ShortCircuitFigures } from './types';

export type BuiltAround =
  | {
      ok: true;
      /** The context of the connected remainder (the whole diagram when every part is connected). */
      ctx: AnalysisContext;
      /** Parts and cables left out of the figures. */
      notConnected: string[];
      /** The loose parts' open terminals. */
      openTerminals: Record<string, string[]>;
      /** The compile errors of the loose parts, one per part: they stay errors in the findings. */
      compileErrors: AnalysisIssue[];
      /** What else was left out, and why. */
      notes: AnalysisIssue[];
    }
  | { ok: false; errors: AnalysisIssue[]; shorts?: DrawnShort[]; shortCircuit?: ShortCircuitFigures; notConnected?: string[] };

const isLoose = (e: AnalysisIssue) => LOOSE_CODES.has(e.code as CompileErrorCode);
const isShort = (e: AnalysisIssue) => SHORT_CODES.has(e.code as CompileErrorCode);

export function buildAround(doc: DiagramDocument): BuiltAround {
  const built = buildContext(doc);
  if (built.ok) return { ok: true, ctx: built.ctx, notConnected: [], openTerminals: {}, compileErrors: [], notes: [] };
  const { errors } = built;
  const loose = errors.filter(isLoose);
  // A separate circuit can be the loose parts themselves (a load hanging off a battery with an open post).
  if (!errors.every((e) => isLoose(e) || isShort(e) || (loose.length > 0 && e.code === 'disconnected_circuit'))) return { ok: false, errors };

  let rem: ConnectedRemainder | null = null;
  let shorted = doc;
  if (loose.length) {
    rem = connectedRemainder(doc);
    const again = buildContext(rem.doc);
    if (again.ok) return { ok: true, ctx: again.ctx, notConnected: rem.notConnected, openTerminals: rem.openTerminals, compileErrors: loose, notes: deadEndNotes(doc, rem) };
    if (!again.errors.every(isShort)) return { ok: false, errors };
    shorted = rem.doc;
  }
  const study = studyShorts(shorted);
  if (!study) return { ok: false, errors };
  return {
    ok: false,
    errors: [...loose, ...study.errors],
    shorts: study.shorts,
    shortCircuit: study.figures,
    ...(rem ? { notConnected: rem.notConnected } : {}),
  };
}

/** A note naming what was left out only because it leads to a loose part. */
function deadEndNotes(doc: DiagramDocument, rem: ConnectedRemainder): AnalysisIssue[] {
  if (!rem.deadEnds.length) return [];
  const names = nameList(rem.deadEnds.map((id) => itemName(doc, id)), 4);
  return [{
    code: 'left_out',
    message: `Also left out of the figures: ${names}, which lead${rem.deadEnds.length === 1 ? 's' : ''} only to parts that are not connected.`,
    parts: rem.deadEnds,
  }];
}
