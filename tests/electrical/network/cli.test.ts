import { execFile } from 'node:child_process';
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';

const tsx = join(process.cwd(), 'node_modules', '.bin', 'tsx');
const script = join(process.cwd(), 'scripts', 'solve.ts');

function run(args: string[]): Promise<{ code: number; stdout: string; stderr: string }> {
  return new Promise((resolve) => {
    execFile(tsx, [script, ...args], { timeout: 30_000 }, (err, stdout, stderr) => {
      resolve({ code: err ? ((err as { code?: number }).code ?? 1) : 0, stdout, stderr });
    });
  });
}

describe('solve CLI', () => {
  const dir = mkdtempSync(join(tmpdir(), 'bw-solve-'));
  const good = join(dir, 'bank.json');
  // 12.8 V / 10 mohm battery into 1 ohm: I = 12.8 / 1.01 A, V = 12.8 / 1.01 V.
  writeFileSync(good, JSON.stringify({
    ground: 'n',
    elements: [
      { id: 'b1', kind: 'battery', pos: 'p', neg: 'n', ocv_V: 12.8, r_ohm: 0.01 },
      { id: 'load', kind: 'load_resistor', a: 'p', b: 'n', r_ohm: 1 },
    ],
  }));
  const broken = join(dir, 'broken.json');
  writeFileSync(broken, '{"ground": "n", ');
  const floating = join(dir, 'floating.json');
  writeFileSync(floating, JSON.stringify({ ground: 'n', elements: [{ id: 'r', kind: 'resistor', a: 'x', b: 'y', r_ohm: 1 }] }));

  it('prints one JSON line per file and exits 0 when all solve', async () => {
    const r = await run([good]);
    expect(r.code).toBe(0);
    const lines = r.stdout.trim().split('\n');
    expect(lines).toHaveLength(1);
    const out = JSON.parse(lines[0]);
    expect(Object.keys(out)).toEqual(['file', 'node_voltages_V', 'element_currents_A']);
    expect(out.file).toBe(good);
    expect(out.node_voltages_V.p).toBeCloseTo(12.8 / 1.01, 12);
    expect(out.element_currents_A.b1).toBeCloseTo(12.8 / 1.01, 12);
  });

  it('reports malformed, unreadable and floating files as error lines and exits 1', async () => {
    const missing = join(dir, 'nope.json');
    const r = await run([good, broken, missing, floating]);
    expect(r.code).toBe(1);
    const lines = r.stdout.trim().split('\n').map((l) => JSON.parse(l));
    expect(lines.map((l) => l.file)).toEqual([good, broken, missing, floating]);
    expect(lines[0].error).toBeUndefined();
    expect(lines[1].error.code).toBe('malformed_network');
    expect(lines[2].error.code).toBe('unreadable_file');
    expect(lines[3].error.code).toBe('floating_node');
    expect(lines[3].error.message).toMatch(/x.*y/);
  });

  it('--timing adds the median solve time', async () => {
    const r = await run(['--timing', good]);
    expect(r.code).toBe(0);
    const out = JSON.parse(r.stdout.trim());
    expect(typeof out.timing_ms.solve).toBe('number');
    expect(out.timing_ms.solve).toBeGreaterThanOrEqual(0);
  });
});
