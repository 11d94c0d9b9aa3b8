/**
 * Accessibility of the diagram editor in chromium: axe-core finds no serious or critical violation on
 * the editor (properties, findings and analysis tabs, every analysis mode's canvas), and the palette,
 * canvas parts, properties and findings work from the keyboard alone.
 */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Browser, Page } from 'playwright-core';
import { postToPostTemplate } from '@shared/diagram';
import { launchBrowser, screenshotPath, signIn, startServer, type RunningServer } from './support';

let server: RunningServer;
let browser: Browser;
const AXE = readFileSync(join(process.cwd(), 'node_modules/axe-core/axe.min.js'), 'utf8');

beforeAll(async () => {
  server = await startServer();
  browser = await launchBrowser();
});

afterAll(async () => {
  await browser?.close();
  await server?.stop();
});

interface AxeViolation {
  id: string;
  impact: string | null;
  help: string;
  nodes: { target: string[]; failureSummary?: string }[];
}

/** Serious and critical axe violations on the page, as readable lines. */
async function seriousViolations(page: Page): Promise<string[]> {
  // Evaluated through the DevTools protocol: the app's Content Security Policy (rightly) refuses inline scripts.
  if (!(await page.evaluate(() => 'axe' in window))) await page.evaluate(AXE);
  const violations = await page.evaluate(async () => {
    const axe = (window as unknown as { axe: { run: (ctx: Document, opts: unknown) => Promise<{ violations: AxeViolation[] }> } }).axe;
    const res = await axe.run(document, { resultTypes: ['violations'] });
    return res.violations.map((v) => ({ id: v.id, impact: v.impact, help: v.help, nodes: v.nodes.slice(0, 5).map((n) => ({ target: n.target, failureSummary: n.failureSummary })) }));
  });
  return violations
    .filter((v) => v.impact === 'serious' || v.impact === 'critical')
    .map((v) => `${v.impact} ${v.id}: ${v.help}\n${v.nodes.map((n) => `  ${n.target.join(' ')} — ${n.failureSummary?.split('\n').slice(1).join(' ')}`).join('\n')}`);
}

async function openNewDiagram(page: Page, name: string, content?: unknown): Promise<void> {
  await signIn(page, server.url, 'designer@demo.test');
  await page.waitForURL(/\/projects/);
  const id = await page.evaluate(
    async ({ name, content }) => {
      const me = await (await fetch('/api/auth/me')).json();
      const { projects } = await (await fetch(`/api/projects?teamId=${me.teams[0].id}`)).json();
      const res = await fetch(`/api/projects/${projects[0].id}/diagrams`, {
        method: 'POST', headers: { 'Content-Type': 'application/json' }, body: JSON.stringify({ name, ...(content ? { content } : {}) }),
      });
      if (res.status !== 201) throw new Error(`create diagram answered ${res.status}`);
      return (await res.json()).diagram.id as string;
    },
    { name, content },
  );
  await page.goto(`${server.url}/diagrams/${id}`);
  await page.getByRole('heading', { name }).waitFor();
}

const tab = (page: Page, name: string) => page.getByRole('tab', { name, exact: true });

describe('editor accessibility', () => {
  it('has no serious or critical axe violations in the editor, its tabs and every analysis mode', async () => {
    const page = await browser.newPage({ viewport: { width: 1440, height: 900 } });
    const doc = postToPostTemplate({ count: 4, takeOff: 'same-end' });
    await openNewDiagram(page, 'Accessibility bank', doc);
    await page.getByTestId('share-bat4').waitFor();
    const found: string[] = [];
    found.push(...(await seriousViolations(page)).map((v) => `[properties] ${v}`));

    await page.locator('.react-flow__node[data-id="bat1"]').click({ position: { x: 10, y: 10 } });
    await page.getByLabel('Internal resistance').waitFor();
    found.push(...(await seriousViolations(page)).map((v) => `[battery selected] ${v}`));

    await tab(page, 'Findings').click();
    await page.getByTestId('findings-counts').waitFor();
    found.push(...(await seriousViolations(page)).map((v) => `[findings] ${v}`));

    await tab(page, 'Analysis').click();
    const modes = page.getByRole('radio');
    const count = await modes.count();
    expect(count).toBeGreaterThanOrEqual(5);
    for (let i = 0; i < count; i++) {
      const label = await modes.nth(i).getAttribute('value');
      await modes.nth(i).check({ force: true });
      // The canvas figures follow the mode (charge mode has none here: no charger in this bank).
      const shown = () => page.evaluate(() => document.querySelector<HTMLElement>('[data-testid="share-bat1"]')?.dataset.mode ?? (document.querySelector('.react-flow') ? 'none' : 'no canvas'));
      await expect.poll(shown, { timeout: 15_000 }).toBe(label === 'charge' ? 'none' : label);
      await page.waitForTimeout(800);
      found.push(...(await seriousViolations(page)).map((v) => `[analysis: ${label}] ${v}`));
    }
    await page.screenshot({ path: screenshotPath('editor-a11y') });
    expect(found, found.join('\n\n')).toEqual([]);
    await page.close();
  });

  it('works from the keyboard: palette, canvas parts (select, arrow keys, Delete), properties and findings', async () => {
    const page = await browser.newPage({ viewport: { width: 1440, height: 900 } });
    await openNewDiagram(page, 'Keyboard bank', postToPostTemplate({ count: 2, takeOff: 'diagonal' }));
    await page.getByTestId('share-bat2').waitFor();
    const nodes = page.locator('.react-flow__node');
    const before = await nodes.count();

    // Palette: focus a part and press Enter to place it.
    await page.getByRole('button', { name: /^Battery / }).focus();
    await page.keyboard.press('Enter');
    await expect.poll(() => nodes.count()).toBe(before + 1);

    // Canvas parts are in the tab order; Enter selects the focused one.
    const bat1 = page.locator('.react-flow__node[data-id="bat1"]');
    expect(await bat1.getAttribute('tabindex')).toBe('0');
    await bat1.focus();
    await page.keyboard.press('Escape');
    await page.keyboard.press('Enter');
    await expect.poll(() => bat1.evaluate((el) => el.classList.contains('selected'))).toBe(true);

    // Arrow keys move the selected part.
    const at = () => bat1.evaluate((el) => (el as HTMLElement).style.transform);
    const start = await at();
    await page.keyboard.press('ArrowRight');
    await page.keyboard.press('ArrowRight');
    await expect.poll(at).not.toBe(start);

    // Properties: the selected part's fields take typing.
    const label = page.getByLabel('Label', { exact: true });
    await label.focus();
    await page.keyboard.press('Control+a');
    await page.keyboard.type('House battery A');
    await expect.poll(() => bat1.textContent()).toContain('House battery A');

    // Findings: reach the tab with the arrow keys, then a finding with Tab; Enter selects its parts.
    await tab(page, 'Properties').focus();
    await page.keyboard.press('ArrowRight');
    await expect.poll(() => tab(page, 'Findings').getAttribute('aria-selected')).toBe('true');
    const finding = page.locator('[data-finding]').first();
    if (await finding.count()) {
      await finding.focus();
      await page.keyboard.press('Enter');
      await expect.poll(() => finding.getAttribute('aria-pressed')).toBe('true');
    }

    // Delete removes the focused, selected part (and its cables).
    await bat1.focus();
    await page.keyboard.press('Enter');
    await expect.poll(() => bat1.evaluate((el) => el.classList.contains('selected'))).toBe(true);
    await page.keyboard.press('Delete');
    await expect.poll(() => bat1.count()).toBe(0);
    await page.screenshot({ path: screenshotPath('editor-keyboard') });
    await page.close();
  });
});
