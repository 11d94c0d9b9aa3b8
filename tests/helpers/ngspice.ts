/**
 * Runs a network through ngspice (Debian package, /usr/bin/ngspice) as an independent check of the
 * solver: writes a SPICE netlist, runs a DC operating point (`op`) in batch mode with tight tolerances,
 * and reads every node voltage and source branch current printed at 17 significant digits.
 *
 * Element models in the netlist:
 * - battery: V (ocv) in series with R; its current is minus the V source's branch current.
 * - resistor / load_resistor: R; current from ngspice's node voltages (Ohm's law).
 * - current_source: I from `from` to `to` (SPICE: current flows from n+ through the source to n-).
 * - constant_power: a B source I = P / V (or V P / v_min^2 below v_min_V), behind a 0 V sense source.
 * - voltage_source: V (ideal) or V + R; with i_max_A (needs r_ohm) a B source I = min(i_max, (V - v) / r)
 *   behind a 0 V sense source.
 */
import { execFile } from 'node:child_process';
import { existsSync, mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import type { Network } from '../../shared/electrical/network/types';

export const NGSPICE = '/usr/bin/ngspice';

/** Throws (so the test fails, never skips) when ngspice is not installed. */
export function requireNgspice(): void {
  if (!existsSync(NGSPICE)) {
    throw new Error(`ngspice not found at ${NGSPICE}: install it (apt-get install ngspice; npm test does this) — the solver verification needs it`);
  }
}

export interface SpiceCircuit {
  netlist: string;
  /** Reads our element currents and node voltages from ngspice's printed vectors. */
  read(values: Map<string, number>): { node_voltages_V: Record<string, number>; element_currents_A: Record<string, number> };
}

const fmt = (x: number) => x.toPrecision(17);

export interface SpiceOptions {
  /** Leave the constant-power loads out (a linear circuit with one solution). */
  omitConstantPower?: boolean;
  /** Initial guess of node voltages (`.nodeset`), by our node names. */
  nodeset?: Record<string, number>;
}

export function toSpice(net: Network, opts: SpiceOptions = {}): SpiceCircuit {
  const nodeName = new Map<string, string>([[net.ground, '0']]);
  const spiceNode = (n: string) => {
    let s = nodeName.get(n);
    if (!s) nodeName.set(n, (s = `n${nodeName.size}`));
    return s;
  };
  for (const n of net.nodes ?? []) spiceNode(n);
  for (const el of net.elements) for (const k of ['pos', 'neg', 'a', 'b', 'from', 'to'] as const) if (k in el) spiceNode((el as unknown as Record<string, string>)[k]);
  const lines = ['* bankwright network'];
  type Reader = (v: (spiceNode: string) => number, branch: (src: string) => number) => number;
  const readers = new Map<string, Reader>();
  net.elements.forEach((el, k) => {
    if (opts.omitConstantPower && el.kind === 'constant_power') return;
    switch (el.kind) {
      case 'battery': {
        const p = spiceNode(el.pos), n = spiceNode(el.neg), x = `x${k}`;
        lines.push(`vb${k} ${x} ${n} dc ${fmt(el.ocv_V)}`, `rb${k} ${x} ${p} ${fmt(el.r_ohm)}`);
        readers.set(el.id, (_v, br) => -br(`vb${k}`));
        break;
      }
      case 'resistor':
      case 'load_resistor': {
        const a = spiceNode(el.a), b = spiceNode(el.b);
        lines.push(`r${k} ${a} ${b} ${fmt(el.r_ohm)}`);
        readers.set(el.id, (v) => (v(a) - v(b)) / el.r_ohm);
        break;
      }
      case 'current_source': {
        lines.push(`i${k} ${spiceNode(el.from)} ${spiceNode(el.to)} dc ${fmt(el.amps)}`);
        readers.set(el.id, () => el.amps);
        break;
      }
      case 'constant_power': {
        const p = spiceNode(el.pos), n = spiceNode(el.neg), x = `x${k}`;
        const vx = `v(${x},${n})`;
        const law =
          el.v_min_V !== undefined
            ? `${vx} < ${fmt(el.v_min_V)} ? ${fmt(el.watts / (el.v_min_V * el.v_min_V))} * ${vx} : ${fmt(el.watts)} / ${vx}`
            : `${fmt(el.watts)} / max(${vx}, 1e-3)`;
        lines.push(`vs${k} ${p} ${x} dc 0`, `bp${k} ${x} ${n} i=${law}`);
        readers.set(el.id, (_v, br) => br(`vs${k}`));
        break;
      }
      case 'voltage_source': {
        const p = spiceNode(el.pos), n = spiceNode(el.neg), x = `x${k}`;
        if (el.i_max_A !== undefined) {
          if (el.r_ohm === undefined) throw new Error(`toSpice: current-limited source ${el.id} needs r_ohm`);
          const vt = `v(${x},${n})`;
          lines.push(`vs${k} ${x} ${p} dc 0`, `bc${k} ${n} ${x} i=min(${fmt(el.i_max_A)}, (${fmt(el.volts)} - ${vt}) / ${fmt(el.r_ohm)})`);
          readers.set(el.id, (_v, br) => br(`vs${k}`));
        } else if (el.r_ohm !== undefined) {
          lines.push(`vv${k} ${x} ${n} dc ${fmt(el.volts)}`, `rv${k} ${x} ${p} ${fmt(el.r_ohm)}`);
          readers.set(el.id, (_v, br) => -br(`vv${k}`));
        } else {
          lines.push(`vv${k} ${p} ${n} dc ${fmt(el.volts)}`);
          readers.set(el.id, (_v, br) => -br(`vv${k}`));
        }
        break;
      }
    }
  });
  if (opts.nodeset) {
    for (const [n, v] of Object.entries(opts.nodeset)) if (n !== net.ground) lines.push(`.nodeset v(${spiceNode(n)})=${fmt(v)}`);
  }
  lines.push(
    '.options reltol=1e-12 abstol=1e-15 vntol=1e-15 itl1=500',
    '.control',
    'set numdgt=17',
    'op',
    'print all',
    '.endc',
    '.end',
    '',
  );
  return {
    netlist: lines.join('\n'),
    read(values) {
      const v = (s: string) => {
        if (s === '0') return 0;
        const x = values.get(s);
        if (x === undefined) throw new Error(`ngspice printed no voltage for node ${s}`);
        return x;
      };
      const br = (src: string) => {
        const x = values.get(`${src}#branch`);
        if (x === undefined) throw new Error(`ngspice printed no current for ${src}`);
        return x;
      };
      const node_voltages_V: Record<string, number> = {};
      for (const [ours, theirs] of nodeName) node_voltages_V[ours] = v(theirs);
      const element_currents_A: Record<string, number> = {};
      for (const [id, r] of readers) element_currents_A[id] = r(v, br);
      return { node_voltages_V, element_currents_A };
    },
  };
}

/** Parses `name = value` lines of `print all`. */
export function parsePrintAll(stdout: string): Map<string, number> {
  const values = new Map<string, number>();
  for (const line of stdout.split('\n')) {
    const m = /^\s*([^\s=]+)\s*=\s*([-+0-9.eE]+)\s*$/.exec(line);
    if (m) values.set(m[1].toLowerCase(), Number(m[2]));
  }
  return values;
}

export function runNgspiceRaw(netlist: string): Promise<{ stdout: string; stderr: string }> {
  requireNgspice();
  const dir = mkdtempSync(join(tmpdir(), 'bw-spice-'));
  const file = join(dir, 'net.cir');
  writeFileSync(file, netlist);
  return new Promise((resolve, reject) => {
    execFile(NGSPICE, ['-b', file], { maxBuffer: 64 * 1024 * 1024, timeout: 120_000 }, (err, stdout, stderr) => {
      rmSync(dir, { recursive: true, force: true });
      // ngspice -b exits 1 after a .control-only run ("no simulations run"); the printed values decide.
      if (err && !/No\. of Data Rows/.test(stdout)) reject(new Error(`ngspice failed: ${err.message}\n${stderr}`));
      else resolve({ stdout, stderr });
    });
  });
}

/**
 * The operating point of a network as ngspice computes it. With constant-power loads, ngspice first
 * solves the circuit without them and starts from that (`.nodeset`): from the unloaded voltages Newton
 * descends to the upper (stable) operating point instead of a collapsed one.
 */
export async function ngspiceOperatingPoint(net: Network) {
  let nodeset: Record<string, number> | undefined;
  if (net.elements.some((el) => el.kind === 'constant_power')) {
    const unloaded = toSpice(net, { omitConstantPower: true });
    nodeset = unloaded.read(parsePrintAll((await runNgspiceRaw(unloaded.netlist)).stdout)).node_voltages_V;
  }
  const circuit = toSpice(net, { nodeset });
  const { stdout, stderr } = await runNgspiceRaw(circuit.netlist);
  const values = parsePrintAll(stdout);
  if (values.size === 0) throw new Error(`ngspice printed no operating point:\n${stdout}\n${stderr}`);
  return circuit.read(values);
}

/** Compares two operating points with the verification tolerances; returns the mismatches. */
export function compareOperatingPoints(
  ours: { node_voltages_V: Record<string, number>; element_currents_A: Record<string, number> },
  spice: { node_voltages_V: Record<string, number>; element_currents_A: Record<string, number> },
  tol = { volts: 1e-6, currentRel: 1e-6, currentAbsBelow1mA: 1e-6 },
): string[] {
  const bad: string[] = [];
  for (const [n, v] of Object.entries(spice.node_voltages_V)) {
    const o = ours.node_voltages_V[n];
    if (!(Math.abs(o - v) <= tol.volts)) bad.push(`node ${n}: ours ${o} V, ngspice ${v} V`);
  }
  for (const [id, i] of Object.entries(spice.element_currents_A)) {
    const o = ours.element_currents_A[id];
    const allowed = Math.abs(i) < 1e-3 ? tol.currentAbsBelow1mA : tol.currentRel * Math.abs(i);
    if (!(Math.abs(o - i) <= allowed)) bad.push(`element ${id}: ours ${o} A, ngspice ${i} A`);
  }
  return bad;
}

type OperatingPoint = { node_voltages_V: Record<string, number>; element_currents_A: Record<string, number> };

/**
 * Operating points of several networks in one ngspice run: the networks share only the ground node,
 * and a single shared node carries no current, so each solves as if alone.
 */
export async function ngspiceOperatingPoints(nets: Network[]): Promise<OperatingPoint[]> {
  const sep = '\u0001';
  const combined: Network = { ground: '0', elements: [] };
  nets.forEach((net, j) => {
    const node = (n: string) => (n === net.ground ? '0' : `${j}${sep}${n}`);
    for (const el of net.elements) {
      const copy = { ...el, id: `${j}${sep}${el.id}` } as Record<string, unknown>;
      for (const key of ['pos', 'neg', 'a', 'b', 'from', 'to']) if (typeof copy[key] === 'string') copy[key] = node(copy[key] as string);
      combined.elements.push(copy as never);
    }
  });
  const all = await ngspiceOperatingPoint(combined);
  return nets.map((net, j) => {
    const prefix = `${j}${sep}`;
    const op: OperatingPoint = { node_voltages_V: { [net.ground]: 0 }, element_currents_A: {} };
    for (const [k, v] of Object.entries(all.node_voltages_V)) if (k.startsWith(prefix)) op.node_voltages_V[k.slice(prefix.length)] = v;
    for (const [k, v] of Object.entries(all.element_currents_A)) if (k.startsWith(prefix)) op.element_currents_A[k.slice(prefix.length)] = v;
    return op;
  });
}
