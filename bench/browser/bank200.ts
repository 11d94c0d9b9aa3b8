/**
 * The benchmark's 200-part bank (an invented layout): 63 batteries on a positive and a negative busbar,
 * a fuse at each battery's positive, a lug joint in each battery's negative cable, the main fuse, a
 * shunt and a disconnect in the main negative, the inverter and five DC loads off the busbars' load taps.
 */
import { busbarBankTemplate, type DiagramCable, type DiagramDocument, type DiagramPart } from '../../shared/diagram';
import { cableRunDefaults, dcLoadDefaults, lugDefaults, shuntDefaults, switchDefaults } from '../../shared/electrical/parts';

export const BATTERIES = 63;

export function bank200(): DiagramDocument {
  const doc = busbarBankTemplate({ count: BATTERIES, name: 'Benchmark: 63 batteries on busbars' });
  const parts: DiagramPart[] = [...doc.parts];
  const cables: DiagramCable[] = [];
  const run = (length_m: number) => ({ ...cableRunDefaults(), length_m });
  for (const c of doc.cables) {
    const m = /^c-neg(\d+)$/.exec(c.id);
    if (m) {
      // Battery negative → lug joint → negative busbar tap.
      const i = Number(m[1]);
      const bat = parts.find((p) => p.id === `bat${i}`)!;
      const lug = `lug${i}`;
      parts.push({ id: lug, type: 'lug', label: `Lug ${i}`, position: { x: bat.position.x + 40, y: 150 }, rotation: 0, props: lugDefaults() });
      cables.push({ ...c, id: `c-neg${i}a`, to: { part: lug, terminal: 'b' }, props: { ...c.props, length_m: 0.2 } });
      cables.push({ ...c, id: `c-neg${i}b`, from: { part: lug, terminal: 'a' }, props: { ...c.props, length_m: c.props.length_m - 0.2 } });
    } else if (c.id === 'c-main-neg') {
      // Negative busbar → shunt → disconnect → inverter negative.
      const inv = parts.find((p) => p.id === 'inverter')!;
      parts.push({ id: 'shunt', type: 'shunt', label: 'Bank shunt', position: { x: inv.position.x - 100, y: 200 }, rotation: 0, props: shuntDefaults() });
      parts.push({ id: 'disconnect', type: 'switch', label: 'Main disconnect', position: { x: inv.position.x - 100, y: 100 }, rotation: 0, props: switchDefaults() });
      cables.push({ ...c, id: 'c-main-neg1', to: { part: 'shunt', terminal: 'a' }, props: { ...c.props, length_m: 0.5 } });
      cables.push({ ...c, id: 'c-main-neg2', from: { part: 'shunt', terminal: 'b' }, to: { part: 'disconnect', terminal: 'a' }, props: { ...c.props, length_m: 0.3 } });
      cables.push({ ...c, id: 'c-main-neg3', from: { part: 'disconnect', terminal: 'b' }, props: { ...c.props, length_m: 1.2 } });
    } else cables.push(c);
  }
  const inv = parts.find((p) => p.id === 'inverter')!;
  for (let k = 1; k <= 5; k++) {
    const id = `load${k}`;
    parts.push({ id, type: 'dc_load', label: `DC load ${k}`, position: { x: inv.position.x + 200 * k, y: 0 }, rotation: 0, props: { ...dcLoadDefaults(), mode: 'current' as const, current_A: 5 } });
    cables.push({ id: `c-load${k}p`, from: { part: 'inverter', terminal: 'pos' }, to: { part: id, terminal: 'pos' }, props: run(1 + k * 0.5) });
    cables.push({ id: `c-load${k}n`, from: { part: 'inverter', terminal: 'neg' }, to: { part: id, terminal: 'neg' }, props: run(1 + k * 0.5) });
  }
  return { ...doc, parts, cables };
}
