import { execFileSync } from 'node:child_process';
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';

const TSX = join(process.cwd(), 'node_modules/.bin/tsx');
const FIX = join(process.cwd(), 'tests/fixtures/diagrams');

function check(...args: string[]): { code: number; stdout: string; stderr: string } {
  return checkIn({}, ...args);
}

/** Run the command as npm does: from the repository root, with INIT_CWD where it was typed. */
function checkIn(env: Record<string, string>, ...args: string[]): { code: number; stdout: string; stderr: string } {
  try {
    const stdout = execFileSync(TSX, [join(process.cwd(), 'scripts/check.ts'), ...args], { encoding: 'utf8', stdio: ['ignore', 'pipe', 'pipe'], env: { ...process.env, ...env } });
    return { code: 0, stdout, stderr: '' };
  } catch (e) {
    const err = e as { status: number; stdout: string; stderr: string };
    return { code: err.status, stdout: err.stdout, stderr: err.stderr };
  }
}

describe('npm run check', () => {
  it('takes a relative path from the directory the command was typed in', () => {
    const r = checkIn({ INIT_CWD: FIX }, 'post-to-post-same-end.json');
    expect(r.code).toBe(0);
    expect(JSON.parse(r.stdout).ok).toBe(true);
  });

  it('--size adds the suggestions and their plan; --apply the applied document with findings before and after', () => {
    const sized = JSON.parse(check(join(FIX, 'post-to-post-same-end.json'), '--size').stdout);
    expect(sized.sizing.ok).toBe(true);
    expect(sized.sizing.branches.map((b: { source: string }) => b.source)).toEqual(['bat1', 'bat2', 'bat3', 'bat4']);
    expect(sized.sizing.plan.pending.length).toBeGreaterThan(0);
    expect(sized.document).toBeUndefined();
    const r = check(join(FIX, 'post-to-post-same-end.json'), '--apply', '--units', 'metric');
    expect(r.code).toBe(0);
    const out = JSON.parse(r.stdout);
    expect(out.apply.applied.length).toBeGreaterThan(0);
    const errors = (fs: { severity: string }[]) => fs.filter((f) => f.severity === 'error').length;
    expect(errors(out.apply.findingsAfter)).toBeLessThanOrEqual(errors(out.apply.findingsBefore));
    // Each applied battery has its fuse at the post: the post holds one cable, to the fuse's battery side (a).
    for (const source of out.apply.applied as string[]) {
      const onPost = (out.document.cables as { from: { part: string; terminal: string }; to: { part: string; terminal: string } }[])
        .filter((c) => (c.from.part === source && c.from.terminal === 'pos') || (c.to.part === source && c.to.terminal === 'pos'));
      expect(onPost).toHaveLength(1);
      expect([onPost[0].from.terminal, onPost[0].to.terminal]).toContain('a');
    }
    const table = check(join(FIX, 'post-to-post-same-end.json'), '--table', '--apply');
    expect(table.stdout).toMatch(/Sizing \(suggestions, not approval to install\)/);
    expect(table.stdout).toMatch(/Applied \d+ suggestion/);
  });

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
    // The connected remainder is still analysed; the open terminal is an error finding and the part is listed.
    const out = JSON.parse(r.stdout);
    expect(out.notConnected).toContain('bat2');
    expect(out.findings.some((f: { id: string; severity: string }) => /unconnected/.test(f.id) && f.severity === 'error')).toBe(true);
  });
});
