/** The cable-run edge: conductor size and length in the team's units, live current and loading against ampacity. */
import { memo } from 'react';
import { BaseEdge, EdgeLabelRenderer, getSmoothStepPath, type Edge, type EdgeProps } from '@xyflow/react';
import { useShallow } from 'zustand/react/shallow';
import type { DiagramCable } from '@shared/diagram';
import { ErrorIcon, NoteIcon, WarningIcon } from '@/components/icons';
import { useEditorStore } from '../store';
import { fmtAmps, fmtPct, lengthText, shortConductor } from '../units';

export interface CableEdgeData extends Record<string, unknown> {
  cable: DiagramCable;
}
export type CableFlowEdge = Edge<CableEdgeData>;

function CableEdgeView({ id, data, selected, sourceX, sourceY, targetX, targetY, sourcePosition, targetPosition }: EdgeProps<CableFlowEdge>) {
  const unitSystem = useEditorStore((s) => s.unitSystem);
  const r = useEditorStore(
    useShallow((s) => {
      const c = s.results?.canvas.cables[id];
      return c ? { i: Math.round(Math.abs(c.current_A) * 10) / 10, loading: c.loading === null ? null : Math.round(c.loading * 1000) / 1000 } : null;
    }),
  );
  const badge = useEditorStore(useShallow((s) => s.results?.canvas.badges[id] ?? null));
  const [path, labelX, labelY] = getSmoothStepPath({ sourceX, sourceY, targetX, targetY, sourcePosition, targetPosition, borderRadius: 8, offset: 18 });
  if (!data) return null;
  const { cable } = data;
  const over = r?.loading != null && r.loading > 1;
  const jumper = cable.props.role === 'jumper';
  const width = r ? Math.min(6, 1.6 + (r.loading ?? 0) * 2.5) : 1.8;
  const BadgeIcon = badge ? (badge.severity === 'error' ? ErrorIcon : badge.severity === 'warning' ? WarningIcon : NoteIcon) : null;
  return (
    <>
      <BaseEdge
        id={id}
        path={path}
        className={`bw-cable${selected ? ' bw-cable-selected' : ''}${over ? ' bw-cable-over' : ''}${jumper ? ' bw-cable-jumper' : ''}`}
        style={{ strokeWidth: selected ? width + 1 : width }}
        interactionWidth={16}
      />
      <EdgeLabelRenderer>
        <div
          className={`bw-cable-label nodrag nopan${selected ? ' bw-cable-label-selected' : ''}${over ? ' bw-over' : ''}`}
          style={{ transform: `translate(-50%, -50%) translate(${labelX}px, ${labelY}px)` }}
          data-cable-id={id}
          onClick={(e) => useEditorStore.getState().select([id], { additive: e.shiftKey || e.metaKey || e.ctrlKey })}
          title={`${cable.label ? `${cable.label}: ` : ''}${cable.props.role === 'jumper' ? 'jumper' : 'cable'}, ${cable.props.material}${r?.loading != null ? `; ${fmtPct(r.loading * 100)} of ampacity` : ''}`}
        >
          <span>
            {shortConductor(cable.props.conductor, unitSystem)} · {lengthText(cable.props.length_m, unitSystem)}
          </span>
          {r ? (
            <span className="bw-cable-figures">
              {fmtAmps(r.i)}
              {r.loading !== null ? ` · ${over ? '▲ over ' : ''}${fmtPct(r.loading * 100)}` : ''}
            </span>
          ) : null}
          {badge && BadgeIcon ? (
            <span className={`bw-badge-inline bw-badge-${badge.severity}`} title={`${badge.count} finding(s)`}>
              <BadgeIcon size={11} /> {badge.count}
            </span>
          ) : null}
        </div>
      </EdgeLabelRenderer>
    </>
  );
}

export const CableEdge = memo(CableEdgeView);

/** React Flow edge types (module scope). */
export const edgeTypes = { cable: CableEdge };
