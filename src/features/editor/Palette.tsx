/**
 * Parts palette: drag a part onto the canvas, or click it (or focus it and press Enter or Space) to
 * place it at the centre of the view; placing again without moving the view cascades each new part
 * down and right of the last, so repeated clicks never stack parts. Below the parts, the team parts library: click a battery, fuse or busbar
 * preset to place one with the preset's props; click a cable preset to apply it to the selected cables.
 */
import { memo, useCallback, useContext, useEffect, useState, type DragEvent } from 'react';
import { useParams } from 'react-router';
import { QueryClientContext, useQuery } from '@tanstack/react-query';
import { useReactFlow } from '@xyflow/react';
import { defaultPartProps, PART_TYPES, type PartType } from '@shared/electrical/parts';
import type { DiagramPart } from '@shared/electrical/document/schema';
import type { LibraryRecord } from '@shared/schemas/library';
import { PaletteGlyph } from './canvas/symbols';
import { PART_DRAG_MIME } from './canvas/Canvas';
import { GRID, partBox } from './canvas/geometry';
import { diagramKeys, fetchDiagram } from './api';
import { useEditorStore } from './store';
import { useLibrary } from '../library/hooks';
import { itemSummary } from '../library/summary';

/** Palette order and the one-line description of each entry. */
export const PALETTE: { type: PartType; hint: string }[] = [
  { type: 'battery', hint: '12 V-class battery' },
  { type: 'series_string', hint: 'N batteries in series' },
  { type: 'busbar', hint: 'Bar with taps' },
  { type: 'fuse', hint: 'Overcurrent protection' },
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

/** Offset between cascaded placements, canvas units (two grid steps down and right). */
export const CASCADE_STEP = GRID * 2;
/** After this many cascaded placements the next one starts again at the centre (offset by the taken-spot check). */
const CASCADE_LENGTH = 8;
let cascade = { key: '', n: 0 };

/**
 * Where the next click-placed part is centred: the view's centre, stepped down and right by one
 * CASCADE_STEP for each placement since the view last moved.
 */
export function cascadedCentre(centre: { x: number; y: number }): { x: number; y: number } {
  const key = `${Math.round(centre.x)},${Math.round(centre.y)}`;
  cascade = cascade.key === key ? { key, n: (cascade.n + 1) % CASCADE_LENGTH } : { key, n: 0 };
  return { x: centre.x + cascade.n * CASCADE_STEP, y: centre.y + cascade.n * CASCADE_STEP };
}

/** For tests: forget the last placement. */
export function resetCascade() {
  cascade = { key: '', n: 0 };
}

/**
 * True while a palette part is being dragged anywhere on the page: overlays on the canvas (the
 * empty-canvas card) let the drop through to the canvas meanwhile.
 */
export function usePartDragActive(): boolean {
  const [active, setActive] = useState(false);
  useEffect(() => {
    const start = (e: globalThis.DragEvent) => {
      if (e.dataTransfer?.types.includes(PART_DRAG_MIME)) setActive(true);
    };
    const end = () => setActive(false);
    document.addEventListener('dragstart', start);
    document.addEventListener('dragend', end);
    document.addEventListener('drop', end);
    return () => {
      document.removeEventListener('dragstart', start);
      document.removeEventListener('dragend', end);
      document.removeEventListener('drop', end);
    };
  }, []);
  return active;
}

const PaletteItem = memo(function PaletteItem({ type, hint, onPlace }: { type: PartType; hint: string; onPlace: (t: PartType) => void }) {
  const onDragStart = useCallback((e: DragEvent) => {
    e.dataTransfer.setData(PART_DRAG_MIME, type);
    e.dataTransfer.effectAllowed = 'copy';
  }, [type]);
  // A button: a click, Enter and Space all place the part (a drag fires no click).
  return (
    <li>
      <button
        type="button"
        draggable
        onDragStart={onDragStart}
        onClick={() => onPlace(type)}
        className="bw-palette-item cursor-pointer"
        aria-describedby="palette-how-to-place"
        title={`${hint}: click to place at the centre of the view, or drag onto the canvas`}
      >
        <PaletteGlyph type={type} />
        <span className="min-w-0">
          <span className="block truncate text-[13px] font-medium text-graphite-800">{PART_TYPES[type].name}</span>{' '}
          <span className="block truncate text-[11px] text-graphite-500">{hint}</span>
        </span>
      </button>
    </li>
  );
});

const snap = (v: number) => Math.round(v / GRID) * GRID;

/**
 * The top-left corner for a part of size `box` centred on `centre` (snapped to the grid), stepped down
 * and right by CASCADE_STEP until it overlaps no part already drawn (with a grid step of clearance);
 * after 100 steps, the first spot.
 */
export function freeSpot(box: { w: number; h: number }, centre: { x: number; y: number }, parts: readonly DiagramPart[]): { x: number; y: number } {
  const first = { x: snap(centre.x - box.w / 2), y: snap(centre.y - box.h / 2) };
  const boxes = parts.map((p) => ({ ...p.position, ...partBox(p) }));
  const overlaps = (at: { x: number; y: number }) =>
    boxes.some((b) => at.x < b.x + b.w + GRID && b.x < at.x + box.w + GRID && at.y < b.y + b.h + GRID && b.y < at.y + box.h + GRID);
  for (let i = 0, at = first; i < 100; i++, at = { x: at.x + CASCADE_STEP, y: at.y + CASCADE_STEP }) if (!overlaps(at)) return at;
  return first;
}

/** Place a part of the palette centred on `centre`, clear of the parts already drawn (see freeSpot). */
export function placePalettePart(type: PartType, centre: { x: number; y: number }): string | null {
  const store = useEditorStore.getState();
  const props = defaultPartProps(type);
  return store.addPart(type, freeSpot(partBox({ type, rotation: 0, props } as DiagramPart), centre, store.doc.parts), { props });
}

/** Place a library preset (battery, fuse, busbar) at the centre of the view, as a palette part, with the preset's props. */
export function placePreset(item: LibraryRecord, centre: { x: number; y: number }): string | null {
  if (item.kind === 'cable') return null;
  const store = useEditorStore.getState();
  const props = structuredClone(item.props) as Record<string, unknown>;
  // A battery's make and model go to the bill of materials.
  if (item.kind === 'battery' && !props.model) props.model = [item.manufacturer, item.partNumber].filter(Boolean).join(' ') || item.name;
  const box = partBox({ type: item.kind, rotation: 0, props } as DiagramPart);
  return store.addPart(item.kind, freeSpot(box, centre, store.doc.parts), { props });
}

/** Apply a cable preset (conductor, material, stranding, insulation) to the selected cables, as one undo step. */
export function applyCablePreset(item: LibraryRecord): number {
  if (item.kind !== 'cable') return 0;
  const store = useEditorStore.getState();
  const selected = new Set(store.selection);
  const ids = store.doc.cables.filter((c) => selected.has(c.id)).map((c) => c.id);
  if (!ids.length) return 0;
  store.edit(`Apply ${item.name}`, (d) => {
    for (const c of d.cables) if (selected.has(c.id)) Object.assign(c.props, structuredClone(item.props));
  });
  return ids.length;
}

/** The team of the open diagram (from the editor's diagram query) and its parts library. */
export function useTeamLibrary() {
  const { diagramId = '' } = useParams();
  const diagram = useQuery({
    queryKey: diagramKeys.detail(diagramId),
    queryFn: ({ signal }) => fetchDiagram(diagramId, signal),
    staleTime: Infinity,
    refetchOnWindowFocus: false,
    refetchOnReconnect: false,
    enabled: !!diagramId,
  });
  return useLibrary(diagram.data?.diagram.teamId);
}

const LIBRARY_GLYPH: Record<LibraryRecord['kind'], PartType | null> = { battery: 'battery', fuse: 'fuse', busbar: 'busbar', cable: null };

function CableGlyph() {
  return (
    <svg width={28} height={28} viewBox="0 0 28 28" className="bw-glyph" aria-hidden="true" focusable="false">
      <path d="M3 20c6 0 6-12 11-12s5 12 11 12" fill="none" stroke="currentColor" strokeWidth={2.5} strokeLinecap="round" />
    </svg>
  );
}

function TeamLibrary({ centre }: { centre: () => { x: number; y: number } }) {
  const library = useTeamLibrary();
  const selectedCables = useEditorStore((s) => {
    if (!s.selection.length) return 0;
    const ids = new Set(s.selection);
    let n = 0;
    for (const c of s.doc.cables) if (ids.has(c.id)) n++;
    return n;
  });
  const items = library.data ?? [];
  if (!library.data) return null;
  return (
    <section aria-labelledby="palette-library" className="border-t border-graphite-200">
      <h2 id="palette-library" className="px-2 pt-2 pb-1 text-[11px] font-semibold tracking-wide text-graphite-500 uppercase">Team library</h2>
      {items.length === 0 ? (
        <p className="px-2 pb-2 text-[11px] text-graphite-500">No presets yet. Owners and designers add them on the Parts library page.</p>
      ) : (
        <ul className="space-y-0.5 px-1 pb-2">
          {items.map((item) => {
            const cable = item.kind === 'cable';
            const disabled = cable && selectedCables === 0;
            const action = cable
              ? selectedCables
                ? `Apply to the ${selectedCables === 1 ? 'selected cable' : `${selectedCables} selected cables`}`
                : 'Select cables to apply this preset'
              : 'Place at the centre of the view';
            const glyph = LIBRARY_GLYPH[item.kind];
            return (
              <li key={item.id}>
                <button
                  type="button"
                  className="bw-palette-item cursor-pointer disabled:cursor-not-allowed disabled:opacity-50"
                  disabled={disabled}
                  onClick={() => (cable ? applyCablePreset(item) : placePreset(item, cascadedCentre(centre())))}
                  aria-describedby="palette-how-to-place"
                  title={`${itemSummary(item)}. ${action}.`}
                >
                  {glyph ? <PaletteGlyph type={glyph} /> : <CableGlyph />}
                  <span className="min-w-0">
                    <span className="block truncate text-[13px] font-medium text-graphite-800">{item.name}</span>{' '}
                    <span className="block truncate text-[11px] text-graphite-500">{cable ? action : itemSummary(item)}</span>
                  </span>
                </button>
              </li>
            );
          })}
        </ul>
      )}
    </section>
  );
}

export function Palette() {
  const centre = useViewCentre();
  const readOnly = useEditorStore((s) => s.readOnly);
  // The library needs the server (a query client); a palette rendered on its own shows the parts only.
  const online = useContext(QueryClientContext) !== undefined;
  const onPlace = useCallback((type: PartType) => {
    placePalettePart(type, cascadedCentre(centre()));
  }, [centre]);
  if (readOnly) return null;
  return (
    <nav aria-label="Parts palette" className="bw-palette">
      <p id="palette-how-to-place" className="sr-only">
        Click or press Enter to place the part at the centre of the view, or drag it onto the canvas. A cable preset applies to the selected cables.
      </p>
      <h2 className="px-2 pt-2 pb-1 text-[11px] font-semibold tracking-wide text-graphite-500 uppercase">Parts</h2>
      <ul className="space-y-0.5 px-1 pb-2">
        {PALETTE.map((p) => (
          <PaletteItem key={p.type} type={p.type} hint={p.hint} onPlace={onPlace} />
        ))}
      </ul>
      {online ? <TeamLibrary centre={centre} /> : null}
    </nav>
  );
}
