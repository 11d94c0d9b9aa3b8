/**
 * The "Diagram" menu (editor toolbar; "Move or copy" on each card of a project page): start a new
 * diagram in this project, move this one to another project of the team, or copy it into one. Shown
 * to roles that may edit diagrams.
 */
import { lazy, Suspense, useState } from 'react';
import { Menu, menuItemClass } from '@/components/Menu';
import type { MovableDiagram } from './MoveCopyDialog';

const NewDiagramDialog = lazy(() => import('./NewDiagramDialog').then((m) => ({ default: m.NewDiagramDialog })));
const MoveCopyDialog = lazy(() => import('./MoveCopyDialog').then((m) => ({ default: m.MoveCopyDialog })));

type Open = null | 'new' | 'move' | 'copy';

export function DiagramMenu({
  diagram,
  withNew = true,
  label = 'Diagram',
  button = 'Diagram',
  buttonClassName = 'inline-flex h-7 items-center rounded-md border border-graphite-200 bg-white px-2.5 text-[13px] font-medium hover:bg-graphite-50',
}: {
  diagram: MovableDiagram;
  withNew?: boolean;
  label?: string;
  button?: string;
  buttonClassName?: string;
}) {
  const [open, setOpen] = useState<Open>(null);
  const [used, setUsed] = useState<Set<Open>>(new Set());
  const show = (which: Exclude<Open, null>) => {
    setUsed((u) => new Set(u).add(which));
    setOpen(which);
  };
  const item = (which: Exclude<Open, null>, text: string, close: () => void) => (
    <button
      type="button"
      role="menuitem"
      tabIndex={-1}
      className={menuItemClass}
      onClick={() => {
        close();
        show(which);
      }}
    >
      {text}
    </button>
  );
  return (
    <>
      <Menu label={label} button={<>{button}</>} buttonClassName={buttonClassName} align="right">
        {({ close }) => (
          <>
            {withNew ? item('new', 'New diagram…', close) : null}
            {item('move', 'Move to another project…', close)}
            {item('copy', 'Copy to a project…', close)}
          </>
        )}
      </Menu>
      <Suspense fallback={null}>
        {used.has('new') ? <NewDiagramDialog projectId={diagram.projectId} open={open === 'new'} onClose={() => setOpen(null)} /> : null}
        {used.has('move') ? <MoveCopyDialog diagram={diagram} mode="move" open={open === 'move'} onClose={() => setOpen(null)} /> : null}
        {used.has('copy') ? <MoveCopyDialog diagram={diagram} mode="copy" open={open === 'copy'} onClose={() => setOpen(null)} /> : null}
      </Suspense>
    </>
  );
}
