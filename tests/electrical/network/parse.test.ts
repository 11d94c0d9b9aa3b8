import { describe, expect, it } from 'vitest';
import { parseNetworkJson, parseNetwork } from '../../../shared/electrical/network/parse';

const ok = {
  ground: 'neg',
  elements: [
    { id: 'b1', kind: 'battery', pos: 'pos', neg: 'neg', ocv_V: 12.8, r_ohm: 0.004 },
    { id: 'load', kind: 'load_resistor', a: 'pos', b: 'neg', r_ohm: 1 },
  ],
};
const text = (v: unknown) => JSON.stringify(v);
const codeOf = (r: ReturnType<typeof parseNetworkJson>) => (r.ok ? 'ok' : r.error.code);

describe('network file parser', () => {
  it('accepts a valid network and ignores unknown fields', () => {
    const r = parseNetworkJson(text({ ...ok, title: 'van house bank', elements: ok.elements.map((e) => ({ ...e, colour: 'red' })) }));
    expect(r.ok).toBe(true);
    if (r.ok) {
      expect(r.network.elements[0]).not.toHaveProperty('colour');
      expect(r.network).not.toHaveProperty('title');
    }
  });

  it('rejects malformed JSON', () => {
    const r = parseNetworkJson('{"ground": "n", "elements": [');
    expect(codeOf(r)).toBe('malformed_network');
    if (!r.ok) expect(r.error.message).toMatch(/JSON/);
  });

  it('rejects an unknown element kind and a missing field, naming the element', () => {
    const a = parseNetwork({ ...ok, elements: [...ok.elements, { id: 'x1', kind: 'capacitor', a: 'pos', b: 'neg' }] });
    expect(codeOf(a)).toBe('malformed_network');
    if (!a.ok) expect(a.error.message).toMatch(/x1/);
    const b = parseNetwork({ ...ok, elements: [{ id: 'b9', kind: 'battery', pos: 'pos', neg: 'neg', r_ohm: 0.01 }] });
    expect(codeOf(b)).toBe('malformed_network');
    if (!b.ok) {
      expect(b.error.message).toMatch(/b9/);
      expect(b.error.message).toMatch(/ocv_V/);
    }
    expect(codeOf(parseNetwork([1, 2]))).toBe('malformed_network');
    expect(codeOf(parseNetwork({ elements: [] }))).toBe('malformed_network');
  });

  it('rejects a reference to a node not in nodes, but takes nodes from the elements when nodes is absent', () => {
    const r = parseNetwork({ ...ok, nodes: ['pos'] , elements: [...ok.elements, { id: 'r1', kind: 'resistor', a: 'pos', b: 'mid', r_ohm: 1 }] });
    expect(codeOf(r)).toBe('unknown_node');
    if (!r.ok) {
      expect(r.error.nodes).toEqual(['mid']);
      expect(r.error.elements).toEqual(['r1']);
    }
    expect(codeOf(parseNetwork({ ...ok, nodes: ['pos', 'neg'] }))).toBe('ok');
  });

  it('rejects duplicate ids', () => {
    const r = parseNetwork({ ...ok, elements: [...ok.elements, { id: 'b1', kind: 'resistor', a: 'pos', b: 'neg', r_ohm: 2 }] });
    expect(codeOf(r)).toBe('duplicate_id');
    if (!r.ok) expect(r.error.elements).toEqual(['b1']);
  });

  it.each([0, -0.5])('rejects r_ohm = %s', (r_ohm) => {
    const r = parseNetwork({ ...ok, elements: [ok.elements[0], { id: 'c1', kind: 'resistor', a: 'pos', b: 'neg', r_ohm }] });
    expect(codeOf(r)).toBe('invalid_value');
    if (!r.ok) expect(r.error.elements).toEqual(['c1']);
  });

  it('rejects a non-finite r_ohm (a JSON number too large for a double)', () => {
    const r = parseNetworkJson(text(ok).replace('"r_ohm":1}', '"r_ohm":1e999}'));
    expect(codeOf(r)).toBe('invalid_value');
    if (!r.ok) expect(r.error.elements).toEqual(['load']);
  });

  it('names every floating node', () => {
    const r = parseNetwork({
      ...ok,
      elements: [
        ...ok.elements,
        { id: 'r1', kind: 'resistor', a: 'isle1', b: 'isle2', r_ohm: 1 },
        { id: 'i1', kind: 'current_source', from: 'pos', to: 'isle1', amps: 1 },
        { id: 'p1', kind: 'constant_power', pos: 'lamp', neg: 'neg', watts: 5 },
      ],
    });
    expect(codeOf(r)).toBe('floating_node');
    if (!r.ok) {
      expect(new Set(r.error.nodes)).toEqual(new Set(['isle1', 'isle2', 'lamp']));
      for (const n of ['isle1', 'isle2', 'lamp']) expect(r.error.message).toContain(n);
    }
  });

  it('rejects a loop of ideal voltage sources, naming its sources', () => {
    const r = parseNetwork({
      ground: 'n',
      elements: [
        { id: 'v1', kind: 'voltage_source', pos: 'a', neg: 'n', volts: 12 },
        { id: 'v2', kind: 'voltage_source', pos: 'b', neg: 'a', volts: 1 },
        { id: 'v3', kind: 'voltage_source', pos: 'b', neg: 'n', volts: 13 },
        { id: 'r', kind: 'resistor', a: 'b', b: 'n', r_ohm: 1 },
      ],
    });
    expect(codeOf(r)).toBe('zero_resistance_loop');
    if (!r.ok) expect(new Set(r.error.elements)).toEqual(new Set(['v1', 'v2', 'v3']));
    // The same sources with a series resistance are a valid network.
    const withR = parseNetwork({
      ground: 'n',
      elements: [
        { id: 'v1', kind: 'voltage_source', pos: 'a', neg: 'n', volts: 12 },
        { id: 'v2', kind: 'voltage_source', pos: 'b', neg: 'a', volts: 1 },
        { id: 'v3', kind: 'voltage_source', pos: 'b', neg: 'n', volts: 13, r_ohm: 0.01 },
      ],
    });
    expect(codeOf(withR)).toBe('ok');
  });
});
