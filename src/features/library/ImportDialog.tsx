/**
 * Import a parts-library CSV. The file is checked here first with the same reader the server uses, so
 * the row-by-row report shows before anything is sent: a clean file imports whole; a file with bad
 * rows offers "Import nothing" or "Import the N valid rows". The server checks again and answers with
 * its own report.
 */
import { useState, type ChangeEvent } from 'react';
import { parseLibraryCsv, type LibraryRowErrors } from '@shared/library';
import { LIBRARY_CSV_MAX_CHARS } from '@shared/schemas/library';
import { Button } from '@/components/Button';
import { Dialog, DialogActions } from '@/components/Dialog';
import { Notice } from '@/components/Notice';
import { errorMessage, isApiError } from '@/lib/api';
import { plural } from '@/lib/format';
import { useImportLibrary } from './hooks';
import { ImportReport } from './ImportReport';

interface Checked {
  fileName: string;
  csv: string;
  valid: number;
  rows: LibraryRowErrors[];
}

export function ImportDialog({ teamId, open, onClose }: { teamId: string; open: boolean; onClose: () => void }) {
  const [checked, setChecked] = useState<Checked | null>(null);
  const [readError, setReadError] = useState<string | null>(null);
  const [done, setDone] = useState<{ imported: number; created: number; updated: number; skipped: number } | null>(null);
  const run = useImportLibrary(teamId);

  function close() {
    setChecked(null);
    setReadError(null);
    setDone(null);
    run.reset();
    onClose();
  }

  async function onFile(e: ChangeEvent<HTMLInputElement>) {
    const file = e.target.files?.[0];
    e.target.value = '';
    setDone(null);
    run.reset();
    if (!file) return;
    if (file.size > LIBRARY_CSV_MAX_CHARS) {
      setChecked(null);
      setReadError(`${file.name} is larger than one import takes (${Math.round(LIBRARY_CSV_MAX_CHARS / 1000)} kB); split it into smaller files.`);
      return;
    }
    const csv = await file.text();
    const parsed = parseLibraryCsv(csv);
    setReadError(null);
    setChecked(parsed.ok ? { fileName: file.name, csv, valid: parsed.items.length, rows: [] } : { fileName: file.name, csv, valid: parsed.validItems.length, rows: parsed.rows });
  }

  function send(mode: 'all_or_nothing' | 'valid_rows') {
    if (!checked) return;
    run.mutate(
      { csv: checked.csv, mode },
      { onSuccess: (r) => setDone({ imported: r.imported, created: r.created, updated: r.updated, skipped: r.rows.length }) },
    );
  }

  const serverRows = isApiError(run.error) ? ((run.error.details as { rows?: LibraryRowErrors[] } | undefined)?.rows ?? null) : null;
  const rows = serverRows ?? checked?.rows ?? [];
  const headerBroken = rows.some((r) => r.row === 0);

  return (
    <Dialog open={open} onClose={close} title="Import parts from CSV" width="max-w-2xl"
      description="One file for every kind: a kind column (battery, cable, fuse or busbar), a name, and a column per rating. Export the library to get a file with every column. Rows carrying the id of an item here update it; other rows add items.">
      <div className="space-y-3 text-sm">
        <label className="block">
          <span className="mb-1 block text-[13px] font-medium text-graphite-800">CSV file</span>
          <input type="file" accept=".csv,text/csv" onChange={onFile} className="block w-full text-[13px] file:mr-3 file:rounded-md file:border file:border-graphite-200 file:bg-white file:px-3 file:py-1.5 file:text-[13px] file:font-medium" />
        </label>
        {readError ? <Notice signal="error">{readError}</Notice> : null}
        {done ? (
          <Notice signal="success">
            {plural(done.imported, 'item')} imported ({done.created} added, {done.updated} updated)
            {done.skipped ? `; ${plural(done.skipped, 'row')} with errors skipped` : ''}.
          </Notice>
        ) : checked ? (
          rows.length === 0 ? (
            <Notice signal="note" title={`${checked.fileName}:`}>
              {plural(checked.valid, 'row')} ready to import, no errors.
            </Notice>
          ) : (
            <>
              <Notice signal="warning" title={`${checked.fileName}:`}>
                {headerBroken
                  ? 'the header row cannot be read, so no row can be imported.'
                  : `${plural(rows.length, 'row')} with errors, ${plural(checked.valid, 'valid row')}. Import nothing and fix the file, or import the valid rows only.`}
              </Notice>
              <ImportReport rows={rows} />
            </>
          )
        ) : null}
        {run.error && !serverRows ? <Notice signal="error">{errorMessage(run.error)}</Notice> : null}
      </div>
      <DialogActions>
        {done ? (
          <Button variant="primary" onClick={close}>
            Close
          </Button>
        ) : checked && rows.length > 0 ? (
          <>
            <Button onClick={close} data-autofocus>
              Import nothing
            </Button>
            {!headerBroken && checked.valid > 0 ? (
              <Button variant="primary" onClick={() => send('valid_rows')} pending={run.isPending}>
                Import the {plural(checked.valid, 'valid row')}
              </Button>
            ) : null}
          </>
        ) : (
          <>
            <Button onClick={close}>Cancel</Button>
            <Button variant="primary" onClick={() => send('all_or_nothing')} disabled={!checked} pending={run.isPending}>
              Import {checked ? plural(checked.valid, 'row') : ''}
            </Button>
          </>
        )}
      </DialogActions>
    </Dialog>
  );
}
