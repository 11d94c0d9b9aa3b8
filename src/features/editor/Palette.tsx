/**
 * Parts palette: drag a part onto the canvas, or focus it and press Enter (or Space) to place it at
 * the centre of the view.
 */
import { memo, useCallback, type DragEvent, type KeyboardEvent } from 'react';
import { useReactFlow } from '@xyflow/react';
import { PART_TYPES, type PartType } from '@shared/electrical/parts';
import { PaletteGlyph } from './canvas/symbols';
import { PART_DRAG_MIME, placePart } from './canvas/Canvas';
import { useEditorStore } from './store';

/** Palette order and the one-line description of each entry. */
export const PALETTE: { type: PartType; hint: string }[] = [
  { type: 'battery', hint: '12 V-class battery' },
  { type: 'series_string', hint: 'N batteries in series' },
  { type: 'busbar', hint: 'Bar with taps' },
  { type: 'fuse', hint: 'Fuse or breaker' },
  { type: 'switch', hint: 'Battery disconnect' },
  { type: 'shunt', hint: 'Current shunt' },
  { type: 'lug', hint: 'Bolted joint' },
  { type: 'inverter', hint: 'DC to AC load' },
  { type: 'dc_load', hint: 'Current, power or resistance' },
  { type: 'charger', hint: 'Charge source' },
  { type: 'note', hint: 'Callout text' },
];

/** The centre of the visible canvas in flow coordinates. */
function useViewCentre() {
  const rf = useReactFlow();
  return useCallback(() => {
    const el = document.querySelector('.bw-canvas');
    const r = el?.getBoundingClientRect();
    const screen = r && r.width > 0 ? { x: r.left + r.width / 2, y: r.top + r.height / 2 } : { x: 0, y: 0 };
    return r && r.width > 0 ? rf.screenToFlowPosition(screen) : screen;
  }, [rf]);
}

const PaletteItem = memo(function PaletteItem({ type, hint, onPlace }: { type: PartType; hint: string; onPlace: (t: PartType) => void }) {
  const onDragStart = useCallback((e: DragEvent) => {
    e.dataTransfer.setData(PART_DRAG_MIME, type);
    e.dataTransfer.effectAllowed = 'copy';
  }, [type]);
  const onKeyDown = useCallback((e: KeyboardEvent) => {
    if (e.key === 'Enter' || e.key === ' ') {
      e.preventDefault();
      onPlace(type);
    }
  }, [type, onPlace]);
  return (
    <li>
      <button
        type="button"
        draggable
        onDragStart={onDragStart}
        onKeyDown={onKeyDown}
        onDoubleClick={() => onPlace(type)}
        className="bw-palette-item"
        aria-label={`${PART_TYPES[type].name}: ${hint}. Press Enter to place at the centre of the view, or drag onto the canvas.`}
        title={`${hint}: drag onto the canvas, or press Enter`}
      >
        <PaletteGlyph type={type} />
        <span className="min-w-0">
          <span className="block truncate text-[13px] font-medium text-graphite-800">{PART_TYPES[type].name}</span>
          <span className="block truncate text-[11px] text-graphite-500">{hint}</span>
        </span>
      </button>
    </li>
  );
});

export function Palette() {
  const centre = useViewCentre();
  const readOnly = useEditorStore((s) => s.readOnly);
  const onPlace = useCallback((type: PartType) => {
    placePart(type, centre());
  }, [centre]);
  if (readOnly) return null;
  return (
    <nav aria-label="Parts palette" className="bw-palette">
      <h2 className="px-2 pt-2 pb-1 text-[11px] font-semibold tracking-wide text-graphite-500 uppercase">Parts</h2>
      <ul className="space-y-0.5 px-1 pb-2">
        {PALETTE.map((p) => (
          <PaletteItem key={p.type} type={p.type} hint={p.hint} onPlace={onPlace} />
        ))}
      </ul>
    </nav>
  );
}
