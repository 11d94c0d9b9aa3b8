/**
 * Where each part's terminals sit on its drawing, before rotation: a side of the node box and a
 * fraction along that side. Rotation (clockwise, in 90° steps) turns sides and swaps the box.
 */
import { Position } from '@xyflow/react';
import type { DiagramCable, DiagramPart } from '@shared/diagram';
import type { PartType } from '@shared/electrical/parts';

export type Side = 'top' | 'right' | 'bottom' | 'left';
export interface TerminalPlacement {
  terminal: string;
  side: Side;
  /** 0..1 along the side (left→right on top/bottom, top→bottom on left/right). */
  at: number;
  /** Polarity mark: '+' and '−' for sources and loads; null for pass-through terminals. */
  polarity: '+' | '−' | null;
}

export const GRID = 10;

const BOX: Record<PartType, { w: number; h: number }> = {
  battery: { w: 128, h: 84 },
  series_string: { w: 136, h: 90 },
  lug: { w: 44, h: 56 },
  busbar: { w: 240, h: 28 },
  fuse: { w: 48, h: 76 },
  switch: { w: 56, h: 76 },
  shunt: { w: 56, h: 76 },
  inverter: { w: 128, h: 84 },
  dc_load: { w: 120, h: 76 },
  charger: { w: 120, h: 72 },
  note: { w: 180, h: 72 },
};

export function busbarWidth(tapCount: number): number {
  return Math.max(160, tapCount * 36 + 16);
}

/** Box of a part before rotation. */
export function baseBox(part: DiagramPart): { w: number; h: number } {
  if (part.type === 'busbar') return { w: busbarWidth(part.props.tapCount), h: BOX.busbar.h };
  return BOX[part.type];
}

/** Box of a part as drawn (rotation applied). */
export function partBox(part: DiagramPart): { w: number; h: number } {
  const b = baseBox(part);
  return part.rotation === 90 || part.rotation === 270 ? { w: b.h, h: b.w } : b;
}

/** Terminal placements before rotation. `tapSide` puts a busbar's taps on its top or bottom edge. */
export function terminalPlacements(part: DiagramPart, tapSide: 'top' | 'bottom' = 'bottom'): TerminalPlacement[] {
  switch (part.type) {
    case 'battery':
    case 'series_string':
    case 'inverter':
    case 'dc_load':
    case 'charger':
      return [
        { terminal: 'pos', side: 'top', at: 0.5, polarity: '+' },
        { terminal: 'neg', side: 'bottom', at: 0.5, polarity: '−' },
      ];
    case 'lug':
    case 'fuse':
    case 'switch':
    case 'shunt':
      return [
        { terminal: 'a', side: 'bottom', at: 0.5, polarity: null },
        { terminal: 'b', side: 'top', at: 0.5, polarity: null },
      ];
    case 'busbar': {
      const n = part.props.tapCount;
      const w = busbarWidth(n);
      return Array.from({ length: n }, (_, i) => ({ terminal: `t${i + 1}`, side: tapSide, at: (26 + i * 36) / w, polarity: null }));
    }
    case 'note':
      return [];
  }
}

/**
 * What a fuse's terminals face: 'a' the battery (the battery's post, or the bank's source side of a
 * main fuse), 'b' the bank (the conductors that carry on to the rest of the bank or to the load).
 */
export const FUSE_TERMINAL_NAMES: Record<string, string> = { a: 'battery side', b: 'bank side' };

/** A terminal in words, for tooltips and screen readers: "positive", "battery side", "tap t3", "terminal a". */
export function terminalName(part: Pick<DiagramPart, 'type'> | undefined, terminal: string): string {
  if (terminal === 'pos') return 'positive';
  if (terminal === 'neg') return 'negative';
  if (part?.type === 'fuse' && FUSE_TERMINAL_NAMES[terminal]) return FUSE_TERMINAL_NAMES[terminal];
  if (part?.type === 'busbar') return `tap ${terminal}`;
  return `terminal ${terminal}`;
}

const SIDES: Side[] = ['top', 'right', 'bottom', 'left'];

/** A placement turned clockwise by `rotation`. */
export function rotatePlacement(p: TerminalPlacement, rotation: number): TerminalPlacement {
  const steps = ((rotation / 90) % 4 + 4) % 4;
  let side = p.side;
  let at = p.at;
  for (let i = 0; i < steps; i++) {
    // Clockwise: top→right keeps the fraction, right→bottom mirrors it, bottom→left keeps it, left→top mirrors it.
    const next = SIDES[(SIDES.indexOf(side) + 1) % 4];
    if (side === 'right' || side === 'left') at = 1 - at;
    side = next;
  }
  return { ...p, side, at };
}

export const POSITION: Record<Side, Position> = { top: Position.Top, right: Position.Right, bottom: Position.Bottom, left: Position.Left };

/** Which edge of each busbar its taps are drawn on: towards the side most of its cables go. */
export function busbarTapSides(parts: DiagramPart[], cables: DiagramCable[]): Map<string, 'top' | 'bottom'> {
  const out = new Map<string, 'top' | 'bottom'>();
  const busbars = parts.filter((p) => p.type === 'busbar');
  if (busbars.length === 0) return out;
  const byId = new Map(parts.map((p) => [p.id, p]));
  for (const bar of busbars) {
    let above = 0;
    let below = 0;
    const cy = bar.position.y + partBox(bar).h / 2;
    for (const c of cables) {
      const other = c.from.part === bar.id ? c.to.part : c.to.part === bar.id ? c.from.part : null;
      const p = other ? byId.get(other) : undefined;
      if (!p || p.id === bar.id) continue;
      if (p.position.y + partBox(p).h / 2 < cy) above++;
      else below++;
    }
    out.set(bar.id, above > below ? 'top' : 'bottom');
  }
  return out;
}
