/**
 * The file picker of "New diagram → From a file": reads and validates the file in the browser
 * (readDiagramFile) and shows its problems by path (at most the first 20), or what it holds.
 */
import { useId, useState, type ChangeEvent } from 'react';
import { MAX_REPORTED_ISSUES, type DiagramDocument, type DiagramIssue } from '@shared/diagram';
import { Notice } from '@/components/Notice';
import { FILE_EXTENSION, MAX_FILE_BYTES, readDiagramFile } from './file';

export type DiagramFileRead =
  | { state: 'none' }
  | { state: 'invalid'; fileName: string; errors: DiagramIssue[]; totalErrors: number }
  | { state: 'valid'; fileName: string; doc: DiagramDocument; migratedFrom?: number };

/** A name for the diagram from the file's name, when the document carries none. */
export function nameFromFile(fileName: string) {
  return fileName.replace(/\.bankwright\.json$|\.json$/i, '').replace(/[-_]+/g, ' ').trim().slice(0, 120) || 'Imported diagram';
}

export async function readFileForImport(file: File): Promise<DiagramFileRead> {
  if (file.size > MAX_FILE_BYTES) {
    return { state: 'invalid', fileName: file.name, errors: [{ path: '$', message: `The file is ${(file.size / 1048576).toFixed(1)} MB; diagram files are at most 5 MB` }], totalErrors: 1 };
  }
  const result = readDiagramFile(await file.text());
  if (!result.ok) return { state: 'invalid', fileName: file.name, errors: result.errors, totalErrors: result.totalErrors };
  return { state: 'valid', fileName: file.name, doc: result.doc, migratedFrom: result.migratedFrom };
}

export function DiagramFileField({ onRead }: { onRead: (read: DiagramFileRead) => void }) {
  const [read, setRead] = useState<DiagramFileRead>({ state: 'none' });
  const inputId = useId();
  const onFile = async (e: ChangeEvent<HTMLInputElement>) => {
    const file = e.target.files?.[0];
    const next = file ? await readFileForImport(file) : ({ state: 'none' } as const);
    setRead(next);
    onRead(next);
  };
  return (
    <div className="space-y-2 text-[13px]">
      <div className="space-y-1">
        <label htmlFor={inputId} className="block font-medium text-graphite-800">
          Diagram file ({FILE_EXTENSION} or .json)
        </label>
        <input id={inputId} type="file" accept=".json,application/json" onChange={(e) => void onFile(e)} className="block w-full text-[13px]" />
        <p className="text-xs text-graphite-500">The file is checked here first; nothing is created unless all of it is valid.</p>
      </div>
      {read.state === 'invalid' ? (
        <div className="space-y-2">
          <Notice signal="error">
            {read.fileName} is not a valid diagram file: {read.totalErrors} problem{read.totalErrors === 1 ? '' : 's'}. Nothing was imported.
          </Notice>
          <ul aria-label="Problems in the file" className="max-h-48 space-y-1 overflow-y-auto rounded-md border border-graphite-200 p-2 font-mono text-xs">
            {read.errors.slice(0, MAX_REPORTED_ISSUES).map((err, i) => (
              <li key={`${err.path}:${i}`}>
                <span className="font-semibold text-fault-700">{err.path}</span>: {err.message}
              </li>
            ))}
          </ul>
          {read.totalErrors > read.errors.length ? <p className="text-xs text-graphite-600">…and {read.totalErrors - read.errors.length} more not listed.</p> : null}
        </div>
      ) : null}
      {read.state === 'valid' ? (
        <Notice signal="success">
          {read.fileName}: {read.doc.parts.length} parts, {read.doc.cables.length} cables, {read.doc.annotations.length} annotations.
          {read.migratedFrom ? ` Converted from format version ${read.migratedFrom}.` : ''}
        </Notice>
      ) : null}
    </div>
  );
}
