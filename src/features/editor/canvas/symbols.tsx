/**
 * Bankwright's part symbols: drawn for this editor, in the unrotated box of each part (geometry.ts).
 * Strokes use currentColor so selection and state restyle them; terminals are React Flow handles
 * drawn on top, not part of these drawings.
 */
import type { ReactNode } from 'react';
import type { PartType } from '@shared/electrical/parts';

const S = { fill: 'none', stroke: 'currentColor', strokeWidth: 1.6, strokeLinecap: 'round', strokeLinejoin: 'round' } as const;

/** Cell mark: long plate (+) over short plate (−), as a battery cell is drawn in schematics. */
function Cell({ x, y, w = 22 }: { x: number; y: number; w?: number }) {
  return (
    <g {...S}>
      <path d={`M${x - w / 2} ${y}h${w}`} strokeWidth={2} />
      <path d={`M${x - w / 4} ${y + 6}h${w / 2}`} strokeWidth={3.2} />
    </g>
  );
}

function BatterySymbol({ w, h }: { w: number; h: number }) {
  return (
    <g>
      <rect x={6} y={8} width={w - 12} height={h - 14} rx={5} className="bw-case" {...S} />
      {/* posts */}
      <rect x={w / 2 - 7} y={3} width={14} height={6} rx={1.5} className="bw-post" {...S} />
      <rect x={w / 2 - 7} y={h - 7} width={14} height={5} rx={1.5} className="bw-post" {...S} />
      <Cell x={20} y={h / 2 - 3} w={16} />
    </g>
  );
}

function SeriesStringSymbol({ w, h }: { w: number; h: number }) {
  return (
    <g>
      <rect x={6} y={8} width={w - 12} height={h - 14} rx={5} className="bw-case" {...S} strokeDasharray="5 3" />
      <rect x={w / 2 - 7} y={3} width={14} height={6} rx={1.5} className="bw-post" {...S} />
      <rect x={w / 2 - 7} y={h - 7} width={14} height={5} rx={1.5} className="bw-post" {...S} />
      <Cell x={20} y={h / 2 - 24} w={14} />
      <path d={`M20 ${h / 2 - 15}v4`} {...S} strokeDasharray="1.5 2" />
      <Cell x={20} y={h / 2 - 6} w={14} />
      <path d={`M20 ${h / 2 + 3}v4`} {...S} strokeDasharray="1.5 2" />
      <Cell x={20} y={h / 2 + 12} w={14} />
    </g>
  );
}

function LugSymbol({ w, h }: { w: number; h: number }) {
  // A ring lug: barrel from the bottom terminal, ring at the top.
  return (
    <g {...S}>
      <path d={`M${w / 2} ${h - 4}V${h / 2 + 6}`} />
      <path d={`M${w / 2 - 5} ${h / 2 + 8}h10v-4l-3 -4h-4l-3 4z`} />
      <circle cx={w / 2} cy={h / 2 - 8} r={9} />
      <circle cx={w / 2} cy={h / 2 - 8} r={3.5} />
      <path d={`M${w / 2} ${h / 2 - 17}V4`} />
    </g>
  );
}

function BusbarSymbol({ w, h }: { w: number; h: number }) {
  return (
    <g>
      <rect x={2} y={h / 2 - 7} width={w - 4} height={14} rx={3} className="bw-bar" />
    </g>
  );
}

function FuseSymbol({ w, h }: { w: number; h: number }) {
  // A slim body with the fusible element running through it, end to end.
  return (
    <g {...S}>
      <path d={`M${w / 2} 4V${h / 2 - 20}M${w / 2} ${h / 2 + 20}V${h - 4}`} />
      <rect x={w / 2 - 9} y={h / 2 - 20} width={18} height={40} rx={3} />
      <path d={`M${w / 2} ${h / 2 - 20}v6l-3 4 6 6-6 6 3 4v6`} strokeWidth={1.3} />
    </g>
  );
}

function SwitchSymbol({ w, h, closed }: { w: number; h: number; closed: boolean }) {
  const cx = w / 2;
  return (
    <g {...S}>
      <path d={`M${cx} 4V${h / 2 - 14}M${cx} ${h / 2 + 14}V${h - 4}`} />
      <circle cx={cx} cy={h / 2 + 14} r={2.6} fill="currentColor" />
      <circle cx={cx} cy={h / 2 - 14} r={2.6} />
      {closed ? <path d={`M${cx} ${h / 2 + 14}L${cx + 1} ${h / 2 - 12}`} strokeWidth={2.4} /> : <path d={`M${cx} ${h / 2 + 14}L${cx + 14} ${h / 2 - 8}`} strokeWidth={2.4} />}
    </g>
  );
}

function ShuntSymbol({ w, h }: { w: number; h: number }) {
  const cx = w / 2;
  return (
    <g {...S}>
      <path d={`M${cx} 4V${h / 2 - 16}M${cx} ${h / 2 + 16}V${h - 4}`} />
      <rect x={cx - 10} y={h / 2 - 16} width={20} height={32} rx={2} />
      <path d={`M${cx - 10} ${h / 2 - 8}h20M${cx - 10} ${h / 2 + 8}h20`} strokeWidth={1} />
      {/* sense leads */}
      <path d={`M${cx + 10} ${h / 2 - 8}h8M${cx + 10} ${h / 2 + 8}h8`} strokeWidth={1.2} strokeDasharray="2 2" />
    </g>
  );
}

/** Icon area on the left of a boxed load or charger: a small square with the part's mark. */
function IconSquare({ h, children }: { h: number; children: ReactNode }) {
  return (
    <g>
      <rect x={9} y={h / 2 - 12} width={22} height={24} rx={2} {...S} strokeWidth={1.2} />
      {children}
    </g>
  );
}

function InverterSymbol({ w, h }: { w: number; h: number }) {
  // DC in the top-left corner of the square, one AC wave in the bottom-right, split by a diagonal.
  const y = h / 2 - 12;
  return (
    <g {...S}>
      <rect x={4} y={6} width={w - 8} height={h - 12} rx={4} className="bw-case" />
      <IconSquare h={h}>
        <path d={`M9 ${y + 24}L31 ${y}`} strokeWidth={1} />
        <path d={`M12 ${y + 5}h8M12 ${y + 8}h2.5m1.5 0h2.5`} strokeWidth={1.1} />
        <path d={`M20 ${y + 18}q2.5-4 5 0t5 0`} strokeWidth={1.1} />
      </IconSquare>
    </g>
  );
}

function DcLoadSymbol({ w, h }: { w: number; h: number }) {
  return (
    <g {...S}>
      <rect x={4} y={6} width={w - 8} height={h - 12} rx={4} className="bw-case" />
      <IconSquare h={h}>
        {/* a heating-element zigzag */}
        <path d={`M11 ${h / 2}l2-5 3 10 3-10 3 10 3-10 2 5`} strokeWidth={1.1} />
      </IconSquare>
    </g>
  );
}

function ChargerSymbol({ w, h }: { w: number; h: number }) {
  return (
    <g {...S}>
      <rect x={4} y={6} width={w - 8} height={h - 12} rx={4} className="bw-case" />
      <IconSquare h={h}>
        <path d={`M12 ${h / 2 - 5}q2-3 4 0t4 0`} strokeWidth={1.1} />
        <path d={`M20 ${h / 2 + 1}l3 3-3 3`} strokeWidth={1.1} />
        <path d={`M12 ${h / 2 + 4}h6`} strokeWidth={1.1} />
      </IconSquare>
    </g>
  );
}

function NoteSymbol({ w, h }: { w: number; h: number }) {
  return (
    <g>
      <path d={`M2 2H${w - 16}L${w - 2} 16V${h - 2}H2z`} className="bw-note" />
      <path d={`M${w - 16} 2V16H${w - 2}`} {...S} strokeWidth={1} />
    </g>
  );
}

export function PartSymbol({ type, w, h, closed = true }: { type: PartType; w: number; h: number; closed?: boolean }): ReactNode {
  switch (type) {
    case 'battery': return <BatterySymbol w={w} h={h} />;
    case 'series_string': return <SeriesStringSymbol w={w} h={h} />;
    case 'lug': return <LugSymbol w={w} h={h} />;
    case 'busbar': return <BusbarSymbol w={w} h={h} />;
    case 'fuse': return <FuseSymbol w={w} h={h} />;
    case 'switch': return <SwitchSymbol w={w} h={h} closed={closed} />;
    case 'shunt': return <ShuntSymbol w={w} h={h} />;
    case 'inverter': return <InverterSymbol w={w} h={h} />;
    case 'dc_load': return <DcLoadSymbol w={w} h={h} />;
    case 'charger': return <ChargerSymbol w={w} h={h} />;
    case 'note': return <NoteSymbol w={w} h={h} />;
  }
}

/** A small version of a part's symbol for the palette (24×24 box). */
export function PaletteGlyph({ type }: { type: PartType }) {
  const boxes: Record<PartType, [number, number]> = {
    battery: [128, 84], series_string: [136, 90], lug: [44, 56], busbar: [100, 28], fuse: [48, 76], switch: [56, 76],
    shunt: [56, 76], inverter: [128, 84], dc_load: [120, 76], charger: [120, 72], note: [120, 72],
  };
  const [w, h] = boxes[type];
  return (
    <svg width={28} height={24} viewBox={`0 0 ${w} ${h}`} preserveAspectRatio="xMidYMid meet" aria-hidden="true" focusable="false" className="bw-glyph">
      <PartSymbol type={type} w={w} h={h} />
    </svg>
  );
}
