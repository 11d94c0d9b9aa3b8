/** The project page's "Import file…" button; the dialog and the validators load on first use. */
import { lazy, Suspense, useState } from 'react';
import { Button } from '@/components/Button';

const ImportDiagramDialog = lazy(() => import('./ImportDiagramDialog').then((m) => ({ default: m.ImportDiagramDialog })));

export function ImportDiagramButton({ projectId }: { projectId: string }) {
  const [open, setOpen] = useState(false);
  const [used, setUsed] = useState(false);
  return (
    <>
      <Button
        onClick={() => {
          setUsed(true);
          setOpen(true);
        }}
      >
        Import file…
      </Button>
      {used ? (
        <Suspense fallback={null}>
          <ImportDiagramDialog projectId={projectId} open={open} onClose={() => setOpen(false)} />
        </Suspense>
      ) : null}
    </>
  );
}
