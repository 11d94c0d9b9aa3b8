/** The bill of materials of the diagram on screen, in a dialog. */
import { useMemo } from 'react';
import { billOfMaterials } from '@shared/diagram/bom';
import { Dialog } from '@/components/Dialog';
import { useEditorStore } from '@/features/editor/store';
import { BomCsvButtons, BomTable } from './BomTable';
import { slug } from '@/features/export/capture';

export function BomDialog({ open, onClose, diagramName }: { open: boolean; onClose: () => void; diagramName: string }) {
  // The document only while open: closed, an edit does not re-render the dialog.
  const doc = useEditorStore((s) => (open ? s.doc : null));
  const unitSystem = useEditorStore((s) => s.unitSystem);
  const bom = useMemo(() => (doc ? billOfMaterials(doc, { unitSystem }) : null), [doc, unitSystem]);
  return (
    <Dialog open={open} onClose={onClose} title="Bill of materials" width="max-w-4xl">
      {bom ? (
        <div className="space-y-3">
          <BomCsvButtons bom={bom} baseName={slug(diagramName)} />
          <div className="max-h-[60vh] overflow-y-auto">
            <BomTable bom={bom} />
          </div>
        </div>
      ) : null}
    </Dialog>
  );
}
