/** Names of parts and cables as the designer wrote them, for the panels. */
import type { DiagramDocument } from '@shared/diagram';
import { useEffect, useMemo, useState } from 'react';
import { useEditorStore } from '../store';

export type LabelOf = (id: string) => string;

export function labelsOf(doc: DiagramDocument): LabelOf {
  const names = new Map<string, string>();
  for (const p of doc.parts) names.set(p.id, p.label || p.id);
  for (const c of doc.cables) names.set(c.id, c.label || c.id);
  return (id) => {
    const hit = names.get(id);
    if (hit) return hit;
    // A series-string member: "<string>/b<k>".
    const m = /^(.+)\/b(\d+)$/.exec(id);
    if (m && names.has(m[1])) return `${names.get(m[1])}, battery ${m[2]}`;
    return id;
  };
}

/** The diagram's part/cable names; changes only when the document does. */
export function useLabels(): LabelOf {
  const doc = useEditorStore((s) => s.doc);
  return useMemo(() => labelsOf(doc), [doc]);
}

let ruleTitles: Map<string, string> | null = null;

/** Rule titles by rule id, loaded with the rule registry on first use (ids are shown until then). */
export function useRuleTitles(): Map<string, string> | null {
  const [titles, setTitles] = useState(ruleTitles);
  useEffect(() => {
    if (titles) return;
    let live = true;
    import('@shared/electrical/rules/rules')
      .then(({ RULES }) => {
        ruleTitles = new Map(RULES.map((r) => [r.id, r.title]));
        if (live) setTitles(ruleTitles);
      })
      .catch(() => {});
    return () => {
      live = false;
    };
  }, [titles]);
  return titles;
}
