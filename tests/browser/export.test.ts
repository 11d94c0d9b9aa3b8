/**
 * Crew-briefing export end to end in chromium: a designer exports a demo diagram as PNG 2× and SVG.
 * The PNG is decoded in the page and checked by its pixels: its size follows from the drawing's bounds
 * measured here in the editor's DOM (plus the sheet's documented margins), and pixels along a cable's
 * path and under a cable label are ink, not background. The SVG parses and carries the caution. The
 * print view shows the bill of materials and the findings.
 */
import { readFileSync } from 'node:fs';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Browser, BrowserContext, Page } from 'playwright-core';
import { launchBrowser, screenshotPath, signIn, startServer, type RunningServer } from './support';

// The sheet's geometry as documented in src/features/export/layout.ts (CSS px at ratio 1).
const MARGIN = 24;
const GAP = 16;
const SIDE = 340;
const PAD = 40;
const MIN_BODY = 760;

let server: RunningServer;
let browser: Browser;
let context: BrowserContext;
let page: Page;
let diagramId: string;

beforeAll(async () => {
  server = await startServer();
  browser = await launchBrowser();
  context = await browser.newContext({ viewport: { width: 1920, height: 1200 }, acceptDownloads: true });
  page = await context.newPage();
  await signIn(page, server.url, 'designer@demo.test');
  await page.waitForURL(/\/projects/);
  diagramId = await page.evaluate(async () => {
    const me = await (await fetch('/api/auth/me')).json();
    const { projects } = await (await fetch(`/api/projects?teamId=${me.teams[0].id}`)).json();
    for (const p of projects) {
      const { diagrams } = await (await fetch(`/api/projects/${p.id}/diagrams`)).json();
      const d = diagrams.find((x: { name: string }) => x.name === 'Post-to-post bank, end take-off');
      if (d) return d.id as string;
    }
    throw new Error('demo diagram not found');
  });
  await page.goto(`${server.url}/diagrams/${diagramId}`);
  await page.locator('.react-flow__node').first().waitFor();
  await page.getByRole('button', { name: 'Dismiss the safety note' }).click();
  await page.locator('.bw-cable-label .bw-cable-figures').first().waitFor(); // live results are in
});

afterAll(async () => {
  await browser?.close();
  await server?.stop();
});

interface Measured {
  zoom: number;
  bounds: { x: number; y: number; w: number; h: number };
  edge: { x: number; y: number }[];
  label: { x: number; y: number; w: number; h: number };
}

/** The drawing's bounds in canvas units, from the DOM: nodes, labels outside them, cable labels. */
function measure(p: Page): Promise<Measured> {
  return p.evaluate(() => {
    const vp = document.querySelector<HTMLElement>('.bw-canvas .react-flow__viewport')!;
    const m = new DOMMatrixReadOnly(getComputedStyle(vp).transform);
    const zoom = m.a;
    const origin = vp.parentElement!.getBoundingClientRect();
    const toFlow = (x: number, y: number) => ({ x: (x - origin.left - m.e) / zoom, y: (y - origin.top - m.f) / zoom });
    let x0 = Infinity, y0 = Infinity, x1 = -Infinity, y1 = -Infinity;
    for (const el of vp.querySelectorAll('.react-flow__node, .bw-part-label, .bw-cable-label')) {
      const r = el.getBoundingClientRect();
      const a = toFlow(r.left, r.top);
      const b = toFlow(r.right, r.bottom);
      x0 = Math.min(x0, a.x); y0 = Math.min(y0, a.y); x1 = Math.max(x1, b.x); y1 = Math.max(y1, b.y);
    }
    // Points along the longest cable path (edge paths are drawn in canvas units), away from any label or
    // part drawn over it (labels sit on a white ground).
    const covers = [...vp.querySelectorAll('.react-flow__node, .bw-cable-label, .bw-part-label')].map((el) => {
      const r = el.getBoundingClientRect();
      const a = toFlow(r.left, r.top);
      const b = toFlow(r.right, r.bottom);
      return { x0: a.x - 6, y0: a.y - 6, x1: b.x + 6, y1: b.y + 6 };
    });
    const paths = [...vp.querySelectorAll<SVGPathElement>('.react-flow__edge-path')];
    const path = paths.sort((a, b) => b.getTotalLength() - a.getTotalLength())[0];
    const len = path.getTotalLength();
    const clear: { x: number; y: number }[] = [];
    for (let t = 0.02; t < 0.98; t += 0.01) {
      const pt = path.getPointAtLength(len * t);
      if (!covers.some((c) => pt.x > c.x0 && pt.x < c.x1 && pt.y > c.y0 && pt.y < c.y1)) clear.push({ x: pt.x, y: pt.y });
    }
    const edge = [0, 1, 2, 3, 4, 5].map((i) => clear[Math.floor((i * (clear.length - 1)) / 5)]);
    const lr = vp.querySelector('.bw-cable-label')!.getBoundingClientRect();
    const la = toFlow(lr.left, lr.top);
    return { zoom, bounds: { x: x0, y: y0, w: x1 - x0, h: y1 - y0 }, edge, label: { x: la.x, y: la.y, w: lr.width / zoom, h: lr.height / zoom } };
  });
}

async function exportAs(p: Page, choice: RegExp) {
  await p.getByRole('button', { name: 'Export…' }).click();
  await p.getByText(choice).click();
  const [download] = await Promise.all([p.waitForEvent('download'), p.getByRole('button', { name: 'Export', exact: true }).click()]);
  const file = await download.path();
  await p.keyboard.press('Escape');
  return { name: download.suggestedFilename(), bytes: readFileSync(file!) };
}

describe('crew briefing export', () => {
  it('exports a PNG at 2× of the whole sheet with edges and labels drawn', async () => {
    const m = await measure(page);
    expect(m.zoom).toBeGreaterThanOrEqual(0.75); // full label detail on screen, as in the export
    const { name, bytes } = await exportAs(page, /^PNG 2×/);
    expect(name).toMatch(/@2x\.png$/);
    expect(bytes.subarray(1, 4).toString('latin1')).toBe('PNG');
    // IHDR: width and height, big-endian, at bytes 16..23.
    const width = bytes.readUInt32BE(16);
    const height = bytes.readUInt32BE(20);
    const dw = Math.ceil(m.bounds.w + 2 * PAD);
    const dh = Math.ceil(m.bounds.h + 2 * PAD);
    const ratio = 2;
    expect(Math.abs(width - (2 * MARGIN + dw + GAP + SIDE) * ratio)).toBeLessThanOrEqual(2 * ratio);
    expect(Math.abs(height - (2 * MARGIN + Math.max(dh, MIN_BODY)) * ratio)).toBeLessThanOrEqual(2 * ratio);

    // Where canvas point (x, y) lands on the sheet image, device px.
    const at = (x: number, y: number) => ({ x: Math.round((MARGIN + x - m.bounds.x + PAD) * ratio), y: Math.round((MARGIN + y - m.bounds.y + PAD) * ratio) });
    const samples = {
      edge: m.edge.map((pt) => at(pt.x, pt.y)),
      label: { ...at(m.label.x, m.label.y), w: Math.round(m.label.w * ratio), h: Math.round(m.label.h * ratio) },
      blank: at(m.bounds.x - PAD / 2, m.bounds.y - PAD / 2),
    };
    const probe = await page.evaluate(async ({ b64, samples }) => {
      const img = new Image();
      img.src = `data:image/png;base64,${b64}`;
      await img.decode();
      const c = document.createElement('canvas');
      c.width = img.naturalWidth;
      c.height = img.naturalHeight;
      const g = c.getContext('2d')!;
      g.drawImage(img, 0, 0);
      const dark = (x: number, y: number, r: number) => {
        const d = g.getImageData(x - r, y - r, 2 * r + 1, 2 * r + 1).data;
        for (let i = 0; i < d.length; i += 4) if (0.299 * d[i] + 0.587 * d[i + 1] + 0.114 * d[i + 2] < 140) return true;
        return false;
      };
      const box = g.getImageData(samples.label.x, samples.label.y, samples.label.w, samples.label.h).data;
      let ink = 0;
      for (let i = 0; i < box.length; i += 4) if (0.299 * box[i] + 0.587 * box[i + 1] + 0.114 * box[i + 2] < 140) ink++;
      const blank = g.getImageData(samples.blank.x, samples.blank.y, 1, 1).data;
      return {
        size: [img.naturalWidth, img.naturalHeight],
        edgeHits: samples.edge.map((p) => dark(p.x, p.y, 3)),
        labelInk: ink / (box.length / 4),
        blank: [...blank],
      };
    }, { b64: bytes.toString('base64'), samples });
    expect(probe.size).toEqual([width, height]);
    expect(probe.edgeHits).toEqual([true, true, true, true, true, true]);
    expect(probe.labelInk).toBeGreaterThan(0.03);
    expect(probe.blank).toEqual([255, 255, 255, 255]);
  });

  it('exports an SVG that parses and carries the safety caution and the not-reviewed mark', async () => {
    const { name, bytes } = await exportAs(page, /^SVG/);
    expect(name).toMatch(/\.svg$/);
    const parsed = await page.evaluate((text) => {
      const doc = new DOMParser().parseFromString(text, 'image/svg+xml');
      return { error: doc.querySelector('parsererror')?.textContent ?? null, root: doc.documentElement.nodeName, text: doc.documentElement.textContent ?? '' };
    }, bytes.toString('utf8'));
    expect(parsed.error).toBeNull();
    expect(parsed.root).toBe('svg');
    expect(parsed.text).toContain('De-energize before work');
    expect(parsed.text).toContain('insulated tools');
    expect(parsed.text).toContain('fuse of the right interrupting rating close to each battery');
    expect(parsed.text).toContain('NOT REVIEWED');
    expect(parsed.text).toContain('Post-to-post bank, end take-off');
  });

  it('shows the sheet, the bill of materials and the findings on the print view', async () => {
    const print = await context.newPage();
    await print.goto(`${server.url}/diagrams/${diagramId}/print`);
    const bom = print.getByRole('table', { name: 'Bill of materials' });
    await bom.waitFor({ timeout: 60_000 });
    await expect.poll(() => bom.getByRole('row').count()).toBeGreaterThan(3);
    const batteries = print.getByRole('table', { name: 'Totals by category' }).getByRole('row', { name: /^Batteries/ });
    expect(await batteries.textContent()).toMatch(/^Batteries4pcs/);
    const findings = print.getByRole('list', { name: 'Findings' });
    expect(await findings.getByRole('listitem').count()).toBeGreaterThan(0);
    expect(await print.getByTestId('briefing-sheet').getByText('Safety caution').count()).toBe(1);
    expect(await print.getByTestId('not-reviewed').count()).toBe(1);
    await print.screenshot({ path: screenshotPath('export-print-view'), fullPage: true });
    await print.close();
  });
});
