/** What a briefing sheet shows, from the editor's document and options. */
import { ANNOTATION_KINDS, drawableAnnotations, stepsInOrder, type AnnotationKind } from '@shared/diagram/annotations';
import type { DiagramDocument } from '@shared/diagram';
import { PART_TYPE_IDS, type PartType } from '@shared/electrical/parts';
import type { AnalysisMode } from '@shared/electrical/analysis';
import type { UnitSystem } from '@shared/units';

const MODE_WORDS: Record<AnalysisMode, string> = {
  load: 'load',
  charge: 'charging',
  equalize: 'equalizing',
  fault: 'fault',
  discharge: 'discharge',
};

/** The labels on the drawing are the bank as drawn (its load case); findings follow the chosen mode. */
export function analysisLabel(mode: AnalysisMode): string {
  return mode === 'load' ? 'Currents and shares of the bank as drawn (load case)' : `Currents and shares as drawn; findings for the ${MODE_WORDS[mode]} case`;
}

export const unitLabel = (u: UnitSystem) => (u === 'metric' ? 'Metric (m, mm²)' : 'US customary (ft, AWG / kcmil)');

export function partTypesIn(doc: DiagramDocument): PartType[] {
  const present = new Set(doc.parts.map((p) => p.type));
  return PART_TYPE_IDS.filter((t) => present.has(t) && t !== 'note');
}

export const stepsOf = (doc: DiagramDocument) => stepsInOrder(drawableAnnotations(doc.annotations));

/** Annotation kinds the document draws (for the legend). */
export function annotationKindsIn(doc: DiagramDocument): AnnotationKind[] {
  const present = new Set(drawableAnnotations(doc.annotations).map((a) => a.kind));
  return ANNOTATION_KINDS.filter((k) => present.has(k));
}
