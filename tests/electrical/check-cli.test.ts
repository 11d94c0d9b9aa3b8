import { execFileSync } from 'node:child_process';
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';

const TSX = join(process.cwd(), 'node_modules/.bin/tsx');
const FIX = join(process.cwd(), 'tests/fixtures/diagrams');

function check(...args: string[]): { code: number; stdout: string; stderr: string } {
  try {
    const stdout = execFileSync(TSX, ['scripts/check.ts', ...args], { encoding: 'utf8', stdio: ['ignore', 'pipe', 'pipe'] });
    return { code: 0, stdout, stderr: '' };
  } catch (e) {
    const err = e as { status: number; stdout: string; stderr: string };
    return { code: err.status, stdout: err.stdout, stderr: err.stderr };
  }
}

describe('npm run check', () => {
  it('prints one JSON document with the results and findings, exit 0', () => {
    const r = check(join(FIX, 'post-to-post-same-end.json'));
    expect(r.code).toBe(0);
    const out = JSON.parse(r.stdout);
    expect(out.ok).toBe(true);
    expect(out.mode).toBe('load');
    expect(Object.keys(out.operating.sources)).toEqual(['bat1', 'bat2', 'bat3', 'bat4']);
    expect(out.findings.map((f: { id: string }) => f.id)).toContain('both-leads-one-battery');
    expect(out.caution).toMatch(/not an approval to install/);
  });

  it('--table prints tables; --mode discharge runs the discharge', () => {
    const r = check(join(FIX, 'mixed-agm-busbar.json'), '--table', '--mode', 'discharge');
    expect(r.code).toBe(0);
    expect(r.stdout).toMatch(/Batteries|Discharge:/);
    expect(r.stdout).toMatch(/Discharge: [\d.]+ h until/);
    expect(r.stdout).toMatch(/mixed-capacity-or-age/);
  });

  it('an invalid diagram exits 1 with JSON paths; an unreadable file exits 1', () => {
    const dir = mkdtempSync(join(tmpdir(), 'bw-check-'));
    const bad = join(dir, 'bad.json');
    writeFileSync(bad, JSON.stringify({ formatVersion: 1, settings: { systemVoltage_V: 12 }, parts: [{ id: 'b1', type: 'battery', position: { x: 0, y: 0 }, props: { chemistry: 'lfp' } }], cables: [] }));
    const r = check(bad);
    expect(r.code).toBe(1);
    const out = JSON.parse(r.stdout);
    expect(out.stage).toBe('parse');
    expect(out.errors.some((e: { path: string }) => e.path.startsWith('$.parts[0].props'))).toBe(true);
    expect(check(join(dir, 'missing.json')).code).toBe(1);
  });

  it('structural errors exit 1', () => {
    const dir = mkdtempSync(join(tmpdir(), 'bw-check-'));
    const f = join(dir, 'open.json');
    const doc = JSON.parse(readFileSync(join(FIX, 'busbar-with-charger.json'), 'utf8'));
    doc.cables = doc.cables.filter((c: { id: string }) => c.id !== 'c-neg2');
    writeFileSync(f, JSON.stringify(doc));
    const r = check(f, '--mode', 'fault');
    expect(r.code).toBe(1);
    expect(JSON.parse(r.stdout).errors[0].code).toBe('unconnected_terminal');
  });
});
