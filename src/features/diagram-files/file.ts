/**
 * Diagram files: the diagram document (docs/file-format.md) as a `.json` file. Reading validates the
 * whole document with zod (`parseDiagram`, which migrates older format versions) and the annotation
 * layer with its own schema (`parseAnnotations`), and reports at most the first 20 problems, each with
 * its JSON path. A file with any problem is not imported.
 */
import { MAX_REPORTED_ISSUES, parseDiagram, type DiagramDocument, type DiagramIssue } from '@shared/diagram';
import { parseAnnotations, pruneDanglingReferences } from '@shared/diagram/annotations';

/** Largest file the import reads, bytes (the API takes diagram documents up to 5 MB). */
export const MAX_FILE_BYTES = 5 * 1024 * 1024;
export const FILE_EXTENSION = '.bankwright.json';

/** The file text of a document: pretty JSON, named, with annotations on removed parts dropped. */
export function diagramFileText(doc: DiagramDocument, name?: string): string {
  const annotations = pruneDanglingReferences(doc);
  const out: DiagramDocument = { ...doc, ...(name ? { name } : {}), annotations };
  return `${JSON.stringify(out, null, 2)}\n`;
}

export type ReadDiagramFile =
  | { ok: true; doc: DiagramDocument; migratedFrom?: number }
  | { ok: false; errors: DiagramIssue[]; totalErrors: number };

export function readDiagramFile(text: string): ReadDiagramFile {
  const parsed = parseDiagram(text);
  if (!parsed.ok) return parsed;
  const layer = parseAnnotations(parsed.doc.annotations, new Set(parsed.doc.parts.map((p) => p.id)));
  if (layer.issues.length) return { ok: false, errors: layer.issues.slice(0, MAX_REPORTED_ISSUES), totalErrors: layer.issues.length };
  return { ok: true, doc: parsed.doc, ...(parsed.migratedFrom ? { migratedFrom: parsed.migratedFrom } : {}) };
}

/** Save a document as a file through a temporary link. */
export function downloadDiagramFile(doc: DiagramDocument, name: string, fileBase: string) {
  const url = URL.createObjectURL(new Blob([diagramFileText(doc, name)], { type: 'application/json' }));
  const a = document.createElement('a');
  a.href = url;
  a.download = `${fileBase}${FILE_EXTENSION}`;
  document.body.appendChild(a);
  a.click();
  a.remove();
  setTimeout(() => URL.revokeObjectURL(url), 10_000);
}
