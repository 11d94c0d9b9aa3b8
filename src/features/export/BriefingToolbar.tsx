/**
 * The editor toolbar's briefing tools: the annotation layer (show / hide, edit), bill of materials,
 * image export and print view, and the diagram file download.
 */
import { useState } from 'react';
import { can, type Role } from '@shared/roles';
import { Button } from '@/components/Button';
import { Menu, menuItemClass } from '@/components/Menu';
import type { DiagramRecord } from '@/features/editor/api';
import { useEditorStore } from '@/features/editor/store';
import { useAnnotationRole, useAnnotationUi } from '@/features/annotations/state';
import { BomDialog } from '@/features/bom/BomDialog';
import { downloadDiagramFile } from '@/features/diagram-files/file';
import { ExportDialog } from './ExportDialog';
import { slug } from './capture';

const menuButton = 'inline-flex h-7 items-center rounded-md border border-graphite-200 bg-white px-2.5 text-[13px] font-medium hover:bg-graphite-50';

export function BriefingToolbar({ diagram, role }: { diagram: DiagramRecord; role: Role }) {
  useAnnotationRole(role);
  const [exportOpen, setExportOpen] = useState(false);
  const [bomOpen, setBomOpen] = useState(false);
  const visible = useAnnotationUi((s) => s.visible);
  const mayAnnotate = can(role, 'diagram.annotate');
  const mayExport = can(role, 'diagram.export');
  return (
    <>
      <Menu label="Annotations" button={<>Annotations{visible ? '' : ' (hidden)'}</>} buttonClassName={menuButton} align="right">
        {({ close }) => (
          <>
            <button
              type="button"
              role="menuitemcheckbox"
              aria-checked={visible}
              tabIndex={-1}
              className={menuItemClass}
              onClick={() => {
                close();
                useAnnotationUi.getState().setVisible(!visible);
              }}
            >
              {visible ? '✓ ' : ''}Show annotations
            </button>
            <button
              type="button"
              role="menuitem"
              tabIndex={-1}
              className={menuItemClass}
              onClick={() => {
                close();
                useAnnotationUi.getState().setVisible(true);
                useAnnotationUi.getState().setPanelOpen(true);
              }}
            >
              {mayAnnotate ? 'Edit annotations…' : 'List annotations…'}
            </button>
          </>
        )}
      </Menu>
      <Button size="sm" variant="ghost" onClick={() => setBomOpen(true)} title="Bill of materials">
        BOM
      </Button>
      {mayExport ? (
        <>
          <Button size="sm" variant="ghost" onClick={() => setExportOpen(true)} title="Image export and print view for a crew briefing">
            Export…
          </Button>
          <Button
            size="sm"
            variant="ghost"
            title="Download the diagram as a file (docs/file-format.md)"
            onClick={() => downloadDiagramFile(useEditorStore.getState().doc, diagram.name, slug(diagram.name))}
          >
            Export file
          </Button>
          <ExportDialog open={exportOpen} onClose={() => setExportOpen(false)} diagram={diagram} />
        </>
      ) : null}
      <BomDialog open={bomOpen} onClose={() => setBomOpen(false)} diagramName={diagram.name} />
    </>
  );
}
