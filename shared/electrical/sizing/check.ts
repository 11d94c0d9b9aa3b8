/**
 * A suggestion is a checked transaction: before the product applies any change it computed (sizing,
 * take-off layout), the design before and after is analysed and compared. A change is safe when it adds
 * no error finding and pushes no part above 100 % of its rating, ampacity or continuous limit (a part
 * already above it is reported by an error finding before and after). The
 * comparison is also the preview the user sees: each unit's share, each changed part's loading, the
 * findings that appear and disappear.
 */
import type { DiagramDocument } from '../document/schema';
import { analyzeDiagram } from '../study/analyze';
import type { AnalysisResult, Finding } from '../analysis/types';

export interface ShareChange {
  id: string;
  label: string;
  before_A: number | null;
  after_A: number | null;
  beforeShare_pct: number | null;
  afterShare_pct: number | null;
}

export interface LoadingChange {
  id: string;
  label: string;
  kind: 'fuse' | 'cable' | 'busbar' | 'switch' | 'shunt' | 'lug' | 'battery';
  /** Current against rating / ampacity / continuous limit, % (null: not in that design or no rating). */
  before_pct: number | null;
  after_pct: number | null;
  current_A: number | null;
}

export interface DesignCheck {
  /** True when the change adds no error and pushes nothing above 100 %. */
  safe: boolean;
  /** Why it is not safe, in plain language with numbers. */
  reasons: string[];
  errors: { before: number; after: number };
  warnings: { before: number; after: number };
  imbalance_pct: { before: number | null; after: number | null };
  shares: ShareChange[];
  /** Parts and cables whose loading changed by more than 0.5 percentage points, or that are new. */
  loading: LoadingChange[];
  appeared: Finding[];
  disappeared: Finding[];
}

/** Loading above this is over the rating (a little slack for rounding), %. */
const LIMIT_PCT = 100 + 1e-6;

/** A finding's identity across the change: its rule and the parts it names that exist in both designs. */
const findingKey = (f: Finding, known: Set<string>) => `${f.id}|${f.parts.filter((p) => known.has(p)).sort().join(',')}`;
const idsOf = (d: DiagramDocument) => new Set([...d.parts.map((p) => p.id), ...d.cables.map((c) => c.id)]);

function loadingOf(doc: DiagramDocument, r: AnalysisResult): Map<string, Omit<LoadingChange, 'before_pct' | 'after_pct'> & { pct: number | null }> {
  const out = new Map<string, Omit<LoadingChange, 'before_pct' | 'after_pct'> & { pct: number | null }>();
  if (!r.ok || !r.operating) return out;
  const op = r.operating;
  const label = (id: string) => doc.parts.find((p) => p.id === id)?.label || doc.cables.find((c) => c.id === id)?.label || id;
  for (const [id, c] of Object.entries(op.cables)) {
    out.set(id, { id, label: label(id), kind: 'cable', pct: c.utilisation_pct, current_A: Math.abs(c.current_A) });
  }
  for (const [id, p] of Object.entries(op.parts)) {
    if (p.type !== 'fuse' && p.type !== 'busbar' && p.type !== 'switch' && p.type !== 'shunt') continue;
    out.set(id, { id, label: label(id), kind: p.type, pct: p.utilisation_pct ?? null, current_A: Math.abs(p.current_A ?? p.maxSegmentCurrent_A ?? 0) });
  }
  for (const [id, s] of Object.entries(op.sources)) {
    out.set(id, { id, label: label(id), kind: 'battery', pct: s.maxContinuous_A > 0 ? (Math.max(0, s.current_A) / s.maxContinuous_A) * 100 : null, current_A: s.current_A });
  }
  return out;
}

const count = (r: AnalysisResult, sev: Finding['severity']) => r.findings.filter((f) => f.severity === sev).length;

/** Compare two designs (load case and rule findings) for a preview and a safety verdict. */
export function checkChange(before: DiagramDocument, after: DiagramDocument, analyzedBefore?: AnalysisResult): DesignCheck {
  const rb = analyzedBefore ?? analyzeDiagram(before, { mode: 'load' });
  const ra = analyzeDiagram(after, { mode: 'load' });
  const reasons: string[] = [];
  const errors = { before: count(rb, 'error'), after: count(ra, 'error') };
  const warnings = { before: count(rb, 'warning'), after: count(ra, 'warning') };
  const beforeIds = idsOf(before);
  const known = new Set([...idsOf(after)].filter((id) => beforeIds.has(id)));
  const beforeKeys = new Set(rb.findings.map((f) => findingKey(f, known)));
  const afterKeys = new Set(ra.findings.map((f) => findingKey(f, known)));
  const appeared = ra.findings.filter((f) => !beforeKeys.has(findingKey(f, known)));
  const disappeared = rb.findings.filter((f) => !afterKeys.has(findingKey(f, known)));
  if (!ra.ok && rb.ok) reasons.push(`The changed design no longer solves: ${ra.errors.map((e) => e.message).join('; ')}.`);
  const added = appeared.filter((f) => f.severity === 'error');
  if (errors.after > errors.before || added.length) {
    const n = Math.max(errors.after - errors.before, added.length);
    reasons.push(`It would add ${n} error${n === 1 ? '' : 's'}${added.length ? `: ${added.map((f) => f.message).join(' ')}` : '.'}`);
  }
  const lb = loadingOf(before, rb);
  const la = loadingOf(after, ra);
  const loading: LoadingChange[] = [];
  for (const [id, a] of la) {
    const b = lb.get(id);
    const bp = b?.pct ?? null;
    const ap = a.pct;
    // Pushed above 100 %: over after, and not over before (a part already over is an error either way).
    if (ap !== null && ap > LIMIT_PCT && (bp === null || bp <= LIMIT_PCT)) {
      reasons.push(`${a.label} would run at ${ap.toFixed(0)} % of its ${a.kind === 'cable' ? 'ampacity' : a.kind === 'battery' ? 'continuous limit' : 'rating'}${bp !== null ? ` (now ${bp.toFixed(0)} %)` : ''}.`);
    }
    if (!b || bp === null || ap === null ? bp !== ap : Math.abs(ap - bp) > 0.5) {
      loading.push({ id, label: a.label, kind: a.kind, before_pct: bp, after_pct: ap, current_A: a.current_A });
    }
  }
  const shares: ShareChange[] = [];
  const sb = rb.ok ? rb.operating?.sources ?? {} : {};
  const sa = ra.ok ? ra.operating?.sources ?? {} : {};
  for (const id of new Set([...Object.keys(sb), ...Object.keys(sa)])) {
    shares.push({
      id, label: after.parts.find((p) => p.id === id)?.label || id,
      before_A: sb[id]?.current_A ?? null, after_A: sa[id]?.current_A ?? null,
      beforeShare_pct: sb[id]?.share_pct ?? null, afterShare_pct: sa[id]?.share_pct ?? null,
    });
  }
  return {
    safe: reasons.length === 0,
    reasons,
    errors,
    warnings,
    imbalance_pct: { before: rb.ok ? rb.operating?.imbalance_pct ?? null : null, after: ra.ok ? ra.operating?.imbalance_pct ?? null : null },
    shares,
    loading,
    appeared,
    disappeared,
  };
}
