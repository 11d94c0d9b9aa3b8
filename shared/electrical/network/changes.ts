/**
 * Small changes to a network for what-if and fault studies: a resistance added between two nodes
 * (e.g. a cable shorted at its load end) or an element replaced by a resistance (a battery internally
 * shorted). `solvePrepared` solves them as low-rank updates of an existing factorization.
 */
import type { Network, NetworkElement, SolveError } from './types';
import { solveError } from './validate';

export type NetworkChange =
  /** A resistance `r_ohm` added between nodes `a` and `b`; it appears in the result as resistor `id`. */
  | { kind: 'shunt'; id: string; a: string; b: string; r_ohm: number }
  /**
   * Element `element` shorted through `r_ohm`: a battery keeps its id and sign convention but loses its
   * EMF (ocv 0 V, r = r_ohm); a resistor or load resistor takes the new resistance.
   */
  | { kind: 'short_element'; element: string; r_ohm: number };

/** A resistance between two nodes (default 1 mohm), e.g. a fault at a cable's load end. */
export function withShunt(a: string, b: string, r_ohm = 1e-3, id = `shunt:${a}:${b}`): NetworkChange {
  return { kind: 'shunt', id, a, b, r_ohm };
}

/** An element shorted through r_ohm (default 1 mohm), e.g. a battery with an internal short. */
export function internalShort(element: string, r_ohm = 1e-3): NetworkChange {
  return { kind: 'short_element', element, r_ohm };
}

/** "Each battery internally shorted in turn": one single-change variant per battery. */
export function batteryShortVariants(net: Network, r_ohm = 1e-3): { label: string; changes: NetworkChange[] }[] {
  return net.elements.filter((el) => el.kind === 'battery').map((el) => ({ label: `${el.id} internally shorted`, changes: [internalShort(el.id, r_ohm)] }));
}

/**
 * "Each cable shorted at its load end": for every listed cable, a shunt from its load-end node to the
 * node given as the other side of the fault (typically the opposite polarity at the load).
 */
export function cableLoadEndShortVariants(
  cables: { cable: string; loadEnd: string; otherSide: string }[],
  r_ohm = 1e-3,
): { label: string; changes: NetworkChange[] }[] {
  return cables.map((c) => ({
    label: `${c.cable} shorted at its load end`,
    changes: [withShunt(c.loadEnd, c.otherSide, r_ohm, `fault:${c.cable}`)],
  }));
}

/**
 * The network with the changes applied (element order kept, shunts appended), or an error naming the
 * change that cannot be applied.
 */
export function applyChanges(net: Network, changes: NetworkChange[]): Network | SolveError {
  const elements: NetworkElement[] = net.elements.slice();
  const index = new Map(elements.map((el, i) => [el.id, i]));
  for (const ch of changes) {
    if (!(Number.isFinite(ch.r_ohm) && ch.r_ohm > 0)) {
      return solveError('invalid_value', `change ${ch.kind === 'shunt' ? `'${ch.id}'` : `to '${ch.element}'`}: r_ohm must be a finite number > 0`);
    }
    if (ch.kind === 'shunt') {
      if (index.has(ch.id)) return solveError('duplicate_id', `shunt id '${ch.id}' is already used`, { elements: [ch.id] });
      index.set(ch.id, elements.length);
      elements.push({ id: ch.id, kind: 'resistor', a: ch.a, b: ch.b, r_ohm: ch.r_ohm, role: 'fault' });
      continue;
    }
    const i = index.get(ch.element);
    if (i === undefined) return solveError('unknown_element', `change refers to element '${ch.element}', which is not in the network`, { elements: [ch.element] });
    const el = elements[i];
    if (el.kind === 'battery') elements[i] = { ...el, ocv_V: 0, r_ohm: ch.r_ohm };
    else if (el.kind === 'resistor' || el.kind === 'load_resistor') elements[i] = { ...el, r_ohm: ch.r_ohm };
    else return solveError('invalid_value', `element '${el.id}' (${el.kind}) cannot be shorted: only batteries and resistors`, { elements: [el.id] });
  }
  return { ...net, elements };
}
