/** The row-by-row report of a parts-library CSV: one line per refused row, each cell error with its column. */
import type { LibraryRowErrors } from '@shared/library';

export function ImportReport({ rows }: { rows: readonly LibraryRowErrors[] }) {
  return (
    <div className="max-h-72 overflow-auto rounded-md border border-graphite-200">
      <table className="w-full text-left text-[13px]" aria-label="Rows with errors">
        <thead className="sticky top-0 bg-graphite-50 text-xs text-graphite-600">
          <tr>
            <th scope="col" className="px-2 py-1.5 font-semibold">Row</th>
            <th scope="col" className="px-2 py-1.5 font-semibold">Line</th>
            <th scope="col" className="px-2 py-1.5 font-semibold">Column</th>
            <th scope="col" className="px-2 py-1.5 font-semibold">Problem</th>
          </tr>
        </thead>
        <tbody>
          {rows.flatMap((r) =>
            r.errors.map((e, i) => (
              <tr key={`${r.row}-${i}`} className="border-t border-graphite-100 align-top">
                <td className="px-2 py-1 font-mono text-graphite-700">{i === 0 ? (r.row === 0 ? 'header' : r.row) : ''}</td>
                <td className="px-2 py-1 font-mono text-graphite-500">{i === 0 ? r.line : ''}</td>
                <td className="px-2 py-1 font-mono text-graphite-700">{e.column || '—'}</td>
                <td className="px-2 py-1 text-graphite-800">{e.message}</td>
              </tr>
            )),
          )}
        </tbody>
      </table>
    </div>
  );
}
