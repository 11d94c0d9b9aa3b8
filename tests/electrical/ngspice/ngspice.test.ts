// Verification against ngspice (Debian package): the same networks solved by an independent circuit
// simulator. Voltages must agree within 1 uV; currents within 1e-6 relative (1e-6 A below 1 mA).
import { beforeAll, describe, expect, it } from 'vitest';
import { busbarBank, postToPostBank, randomMesh, seriesParallelBank } from '../../../shared/electrical/network/builders';
import { solveNetwork } from '../../../shared/electrical/network/solve';
import type { Network, NetworkElement, SolveResult } from '../../../shared/electrical/network/types';
import { compareOperatingPoints, ngspiceOperatingPoints, requireNgspice } from '../../helpers/ngspice';

function ours(net: Network): SolveResult {
  const r = solveNetwork(net);
  if (!r.ok) throw new Error(`${r.error.code}: ${r.error.message}`);
  return r;
}

async function expectAgreement(nets: Network[]) {
  const spice = await ngspiceOperatingPoints(nets);
  nets.forEach((net, j) => {
    const mismatches = compareOperatingPoints(ours(net), spice[j]);
    expect(mismatches.slice(0, 5), `network ${j}`).toEqual([]);
    // Every element and node was compared.
    expect(Object.keys(spice[j].element_currents_A)).toHaveLength(net.elements.length);
  });
}

/** The battery `id` replaced by a resistance between its posts (an internal short). */
function shorted(net: Network, id: string, r_ohm = 0.001): Network {
  return {
    ...net,
    elements: net.elements.map((el): NetworkElement =>
      el.id === id && el.kind === 'battery' ? { id, kind: 'resistor', a: el.pos, b: el.neg, r_ohm } : el,
    ),
  };
}

beforeAll(() => requireNgspice());

describe('solver agrees with ngspice', () => {
  it.each([2, 3, 4, 5, 6, 7, 8, 9, 10, 11, 12])('post-to-post bank of %i batteries, every take-off pair', async (count) => {
    const nets: Network[] = [];
    for (let posTap = 1; posTap <= count; posTap++) {
      for (let negTap = 1; negTap <= count; negTap++) {
        nets.push(postToPostBank({ count, posTap, negTap, link_ohm: 0.0004, lead_ohm: 0.0015, load: { kind: 'load_resistor', r_ohm: 0.05 } }));
      }
    }
    await expectAgreement(nets);
  });

  it('busbar stars with unequal cables, resistive and constant-power loads', async () => {
    const nets: Network[] = [];
    for (let count = 2; count <= 12; count++) {
      const cable_ohm = Array.from({ length: count }, (_, k) => 0.0005 + 0.0003 * k);
      nets.push(busbarBank({ count, cable_ohm, load: { kind: 'load_resistor', r_ohm: 0.1 } }));
      nets.push(busbarBank({ count, cable_ohm, load: { kind: 'constant_power', watts: 1500 } }));
    }
    await expectAgreement(nets);
  });

  it('series-parallel strings (4S2P, 2S3P, 3S4P)', async () => {
    await expectAgreement([
      seriesParallelBank({ series: 4, parallel: 2, load: { kind: 'load_resistor', r_ohm: 1.2 } }),
      seriesParallelBank({ series: 2, parallel: 3, load: { kind: 'constant_power', watts: 2000 } }),
      seriesParallelBank({ series: 3, parallel: 4, load: { kind: 'current_source', amps: 80 } }),
    ]);
  });

  it('mixed battery voltages (circulating currents)', async () => {
    await expectAgreement([
      postToPostBank({ count: 4, posTap: 1, negTap: 4, ocv_V: [13.3, 12.9, 12.4, 13.1], load: { kind: 'load_resistor', r_ohm: 0.2 } }),
      busbarBank({ count: 5, ocv_V: [12.2, 12.6, 13.4, 12.8, 12.0], r_internal_ohm: [0.003, 0.004, 0.006, 0.005, 0.01], load: { kind: 'current_source', amps: 0 } }),
    ]);
  });

  it('chargers: setpoint with series resistance, in voltage mode and in current limit, and an ideal source', async () => {
    const nets = [
      busbarBank({ count: 4, load: { kind: 'load_resistor', r_ohm: 0.5 }, charger: { volts: 14.4, r_ohm: 0.01 } }),
      busbarBank({ count: 4, load: { kind: 'load_resistor', r_ohm: 0.5 }, charger: { volts: 14.4, r_ohm: 0.01, i_max_A: 400 } }),
      busbarBank({ count: 4, load: { kind: 'load_resistor', r_ohm: 0.5 }, charger: { volts: 14.4, r_ohm: 0.01, i_max_A: 40 } }),
      {
        ground: 'n',
        elements: [
          { id: 'psu', kind: 'voltage_source', pos: 'p', neg: 'n', volts: 13.8 },
          { id: 'c1', kind: 'resistor', a: 'p', b: 'b+', r_ohm: 0.003 },
          { id: 'b1', kind: 'battery', pos: 'b+', neg: 'n', ocv_V: 12.9, r_ohm: 0.006 },
          { id: 'l1', kind: 'load_resistor', a: 'p', b: 'n', r_ohm: 0.7 },
        ],
      } satisfies Network,
    ];
    const limited = ours(nets[2]);
    expect(limited.notes.map((n) => n.code)).toContain('current_limit');
    expect(ours(nets[1]).notes).toEqual([]);
    await expectAgreement(nets);
  });

  it('faults: each battery in turn internally shorted (1 mohm)', async () => {
    const bank = postToPostBank({ count: 6, posTap: 1, negTap: 6, load: { kind: 'load_resistor', r_ohm: 0.3 } });
    const star = busbarBank({ count: 6, cable_ohm: [0.001, 0.0012, 0.0009, 0.002, 0.0011, 0.0015], load: { kind: 'constant_power', watts: 800 } });
    const nets: Network[] = [];
    for (let k = 1; k <= 6; k++) nets.push(shorted(bank, `b${k}`), shorted(star, `b${k}`));
    await expectAgreement(nets);
  });

  it('constant-power loads with and without a v_min_V guard', async () => {
    await expectAgreement([
      postToPostBank({ count: 3, posTap: 1, negTap: 3, load: { kind: 'constant_power', watts: 3000 } }),
      // 12.8 V / 50 mohm can give at most 819 W; with v_min_V = 10 V the load settles as 0.1 ohm.
      { ground: 'n', elements: [
        { id: 'bat', kind: 'battery', pos: 'p', neg: 'n', ocv_V: 12.8, r_ohm: 0.05 },
        { id: 'inv', kind: 'constant_power', pos: 'p', neg: 'n', watts: 1000, v_min_V: 10 },
      ] },
    ]);
  });

  it('the comparison itself catches a 2 uV or a 2 ppm difference', async () => {
    const net = busbarBank({ count: 3, load: { kind: 'load_resistor', r_ohm: 0.1 } });
    const [spice] = await ngspiceOperatingPoints([net]);
    const r = ours(net);
    expect(compareOperatingPoints(r, spice)).toEqual([]);
    const offV = { ...r, node_voltages_V: { ...r.node_voltages_V, 'bus+': r.node_voltages_V['bus+'] + 2e-6 } };
    expect(compareOperatingPoints(offV, spice)).toHaveLength(1);
    const offI = { ...r, element_currents_A: { ...r.element_currents_A, b2: r.element_currents_A.b2 * (1 + 2e-6) } };
    expect(compareOperatingPoints(offI, spice)).toHaveLength(1);
  });

  it.each([1, 2, 3])('random ladder/mesh of about 2,000 elements (seed %i)', async (seed) => {
    const net = randomMesh({ elements: 2000, width: 4 + seed * 2, seed, sources: true, constantPower: 3 });
    expect(net.elements.length).toBeGreaterThan(1800);
    await expectAgreement([net]);
  });
});
