/**
 * Import a diagram file into a project: the file is read and validated in the browser; a broken file
 * lists its problems (path and message, at most the first 20) and nothing is sent; a valid one becomes
 * a new diagram through POST /api/projects/:id/diagrams.
 */
import { useId, useState, type ChangeEvent, type FormEvent } from 'react';
import { useNavigate } from 'react-router';
import { useMutation, useQueryClient } from '@tanstack/react-query';
import { MAX_REPORTED_ISSUES, type DiagramDocument, type DiagramIssue } from '@shared/diagram';
import { Button } from '@/components/Button';
import { Dialog } from '@/components/Dialog';
import { Notice } from '@/components/Notice';
import { errorMessage } from '@/lib/api';
import { createDiagram } from '@/features/revisions/api';
import { projectKeys } from '@/features/projects/hooks';
import { FILE_EXTENSION, MAX_FILE_BYTES, readDiagramFile } from './file';

type Read =
  | { state: 'none' }
  | { state: 'invalid'; fileName: string; errors: DiagramIssue[]; totalErrors: number }
  | { state: 'valid'; fileName: string; doc: DiagramDocument; migratedFrom?: number };

function nameFromFile(fileName: string) {
  return fileName.replace(/\.bankwright\.json$|\.json$/i, '').replace(/[-_]+/g, ' ').trim().slice(0, 120) || 'Imported diagram';
}

export function ImportDiagramDialog({ projectId, open, onClose }: { projectId: string; open: boolean; onClose: () => void }) {
  const [read, setRead] = useState<Read>({ state: 'none' });
  const [name, setName] = useState('');
  const inputId = useId();
  const nameId = useId();
  const qc = useQueryClient();
  const navigate = useNavigate();
  const create = useMutation({
    mutationFn: (body: { name: string; content: DiagramDocument }) => createDiagram(projectId, body),
    onSuccess: async (diagram) => {
      await qc.invalidateQueries({ queryKey: projectKeys.diagrams(projectId) });
      close();
      navigate(`/diagrams/${diagram.id}`);
    },
  });

  const close = () => {
    setRead({ state: 'none' });
    setName('');
    create.reset();
    onClose();
  };

  const onFile = async (e: ChangeEvent<HTMLInputElement>) => {
    const file = e.target.files?.[0];
    create.reset();
    if (!file) return setRead({ state: 'none' });
    if (file.size > MAX_FILE_BYTES) {
      return setRead({ state: 'invalid', fileName: file.name, errors: [{ path: '$', message: `The file is ${(file.size / 1048576).toFixed(1)} MB; diagram files are at most 5 MB` }], totalErrors: 1 });
    }
    const result = readDiagramFile(await file.text());
    if (!result.ok) return setRead({ state: 'invalid', fileName: file.name, errors: result.errors, totalErrors: result.totalErrors });
    setRead({ state: 'valid', fileName: file.name, doc: result.doc, migratedFrom: result.migratedFrom });
    setName(result.doc.name?.trim() || nameFromFile(file.name));
  };

  const submit = (e: FormEvent) => {
    e.preventDefault();
    if (read.state !== 'valid' || !name.trim()) return;
    create.mutate({ name: name.trim(), content: { ...read.doc, name: name.trim() } });
  };

  return (
    <Dialog open={open} onClose={close} title="Import a diagram file" width="max-w-xl">
      <form onSubmit={submit} className="space-y-4 text-[13px]">
        <div className="space-y-1">
          <label htmlFor={inputId} className="block font-medium text-graphite-800">
            Diagram file ({FILE_EXTENSION} or .json)
          </label>
          <input id={inputId} type="file" accept=".json,application/json" onChange={(e) => void onFile(e)} className="block w-full text-[13px]" />
          <p className="text-xs text-graphite-500">The file is checked here first; nothing is imported unless all of it is valid.</p>
        </div>
        {read.state === 'invalid' ? (
          <div className="space-y-2">
            <Notice signal="error">
              {read.fileName} is not a valid diagram file: {read.totalErrors} problem{read.totalErrors === 1 ? '' : 's'}. Nothing was imported.
            </Notice>
            <ul aria-label="Problems in the file" className="max-h-64 space-y-1 overflow-y-auto rounded-md border border-graphite-200 p-2 font-mono text-xs">
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
          <div className="space-y-3">
            <Notice signal="success">
              {read.fileName}: {read.doc.parts.length} parts, {read.doc.cables.length} cables, {read.doc.annotations.length} annotations.
              {read.migratedFrom ? ` Converted from format version ${read.migratedFrom}.` : ''}
            </Notice>
            <div className="space-y-1">
              <label htmlFor={nameId} className="block font-medium text-graphite-800">Name of the new diagram</label>
              <input id={nameId} className="bw-input block h-9 w-full rounded-md border border-graphite-300 px-2.5" value={name} maxLength={120} onChange={(e) => setName(e.target.value)} required />
            </div>
          </div>
        ) : null}
        {create.isError ? <Notice signal="error">The diagram was not created: {errorMessage(create.error)}</Notice> : null}
        <div className="flex justify-end gap-2">
          <Button variant="ghost" onClick={close}>
            Cancel
          </Button>
          <Button type="submit" variant="primary" disabled={read.state !== 'valid' || !name.trim()} pending={create.isPending}>
            Import
          </Button>
        </div>
      </form>
    </Dialog>
  );
}
