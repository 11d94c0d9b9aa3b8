/**
 * From a blank project to a placed part, and nothing lost on close: a designer creates a project and a
 * diagram from a template in the browser, places a part with a click and one by dragging it onto the
 * empty-canvas card, then closes the tab about 50 ms after an edit and finds the edit on reopening,
 * first from the copy kept in the browser, then (a fresh browser profile) from the copy sent to the
 * server as the page went away.
 */
import { mkdirSync } from 'node:fs';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Browser, BrowserContext, Page } from 'playwright-core';
import { launchBrowser, screenshotPath, signIn, startServer, type RunningServer } from './support';

let server: RunningServer;
let browser: Browser;
const SHOTS = process.env.SHOTS_DIR;

beforeAll(async () => {
  server = await startServer();
  browser = await launchBrowser();
});

afterAll(async () => {
  await browser?.close();
  await server?.stop();
});

async function shot(page: Page, name: string) {
  if (SHOTS) {
    mkdirSync(SHOTS, { recursive: true });
    await page.screenshot({ path: join(SHOTS, `${name}.png`) });
  } else await page.screenshot({ path: screenshotPath(name) });
}

/** A page that records anything thrown on it. */
async function watchedPage(context: BrowserContext): Promise<{ page: Page; errors: string[] }> {
  const page = await context.newPage();
  const errors: string[] = [];
  page.on('pageerror', (e) => errors.push(e.message));
  return { page, errors };
}

async function workingCopyParts(page: Page, id: string): Promise<string[]> {
  return page.evaluate(async (diagramId) => {
    const res = await fetch(`/api/diagrams/${diagramId}`);
    return ((await res.json()).diagram.content.parts as { type: string }[]).map((p) => p.type);
  }, id);
}

async function dismissSafetyNote(page: Page) {
  const dismiss = page.getByRole('button', { name: 'Dismiss the safety note' });
  if (await dismiss.isVisible()) await dismiss.click();
}

describe('new diagram, placing parts, nothing lost on close', () => {
  let diagramUrl = '';
  let diagramId = '';
  let context: BrowserContext;

  it('creates a project and a diagram from a template, and places a part with a click', async () => {
    context = await browser.newContext({ viewport: { width: 1440, height: 900 } });
    const { page, errors } = await watchedPage(context);
    await signIn(page, server.url, 'designer@demo.test');
    await page.waitForURL(/\/projects/);
    await page.getByRole('button', { name: /New project/ }).first().click();
    await page.getByLabel('Project name').fill('Quarry office 24 V');
    await page.getByRole('dialog').getByRole('button', { name: /Create/ }).click();
    await page.getByRole('heading', { name: 'Quarry office 24 V' }).waitFor();
    await shot(page, '01-empty-project');

    await page.getByRole('button', { name: 'New diagram…' }).click();
    const dialog = page.getByRole('dialog', { name: 'New diagram' });
    await dialog.getByLabel('Diagram name').fill('Office bank');
    await dialog.getByText('From a template').click();
    await dialog.getByText('Batteries post to post').click();
    await dialog.getByLabel('Batteries in parallel', { exact: true }).fill('3');
    await dialog.getByLabel('Take-off', { exact: true }).selectOption('diagonal');
    await shot(page, '02-new-diagram-template');
    await dialog.getByRole('button', { name: 'Create and open' }).click();
    await page.waitForURL(/\/diagrams\/[^/]+$/);
    await page.getByRole('heading', { name: 'Office bank' }).waitFor();
    await dismissSafetyNote(page);
    diagramUrl = page.url();
    diagramId = diagramUrl.split('/').pop()!;
    const templateParts = await page.locator('.react-flow__node').count();
    expect((await workingCopyParts(page, diagramId)).filter((t) => t === 'battery')).toHaveLength(3);
    expect(templateParts).toBeGreaterThan(3);

    // A click on a generic part places it; a second click cascades rather than stacking.
    await page.getByRole('navigation', { name: 'Parts palette' }).getByRole('button', { name: /^Shunt / }).click();
    await page.getByRole('navigation', { name: 'Parts palette' }).getByRole('button', { name: /^Shunt / }).click();
    await expect.poll(() => page.locator('.react-flow__node').count()).toBe(templateParts + 2);
    const boxes = await page.locator('.react-flow__node-shunt').evaluateAll((els) => els.map((e) => (e as HTMLElement).style.transform));
    expect(new Set(boxes).size).toBe(2);
    await shot(page, '03-placed-by-click');
    await expect.poll(() => page.getByRole('status').filter({ hasText: /^Saved$/ }).count(), { timeout: 15_000 }).toBe(1);

    // The "?" help opens on the how-to, each step with a drawing.
    await page.getByRole('button', { name: 'Help: how-to and keyboard shortcuts' }).click();
    const help = page.getByRole('dialog', { name: 'How to' });
    await help.getByRole('tab', { name: 'Compare and sign off' }).click();
    expect(await help.getByRole('tabpanel').getByRole('img').count()).toBeGreaterThanOrEqual(3);
    await shot(page, '06-help-sign-off');
    await page.keyboard.press('Escape');

    // The bill of materials names parts by label and categories by name.
    await page.getByRole('button', { name: 'BOM', exact: true }).click();
    const bom = page.getByRole('table', { name: 'Bill of materials' });
    await expect.poll(() => bom.getByRole('cell', { name: 'Fuse holders', exact: true }).count()).toBe(1);
    expect(await bom.getByRole('cell', { name: 'Battery 1; Battery 2; Battery 3' }).count()).toBe(1);
    await shot(page, '07-bom');
    await page.keyboard.press('Escape');
    expect(errors).toEqual([]);
    await page.close();
  });

  it('a part dragged onto the empty-canvas card lands on the canvas', async () => {
    const { page, errors } = await watchedPage(context);
    await page.goto(`${server.url}/`);
    const id = await page.evaluate(async (source) => {
      const d = (await (await fetch(`/api/diagrams/${source}`)).json()).diagram;
      const res = await fetch(`/api/projects/${d.projectId}/diagrams`, { method: 'POST', headers: { 'Content-Type': 'application/json' }, body: JSON.stringify({ name: 'Blank for drop' }) });
      return (await res.json()).diagram.id as string;
    }, diagramId);
    await page.goto(`${server.url}/diagrams/${id}`);
    await page.getByRole('heading', { name: 'Blank for drop' }).waitFor();
    const card = page.getByTestId('empty-canvas');
    await card.waitFor();
    const box = (await card.boundingBox())!;
    const canvas = (await page.locator('.bw-canvas').boundingBox())!;
    // Drop on the middle of the card itself.
    await page.getByRole('button', { name: /^Battery / }).dragTo(page.locator('.bw-canvas'), {
      targetPosition: { x: box.x + box.width / 2 - canvas.x, y: box.y + box.height / 2 - canvas.y },
    });
    await expect.poll(() => page.locator('.react-flow__node').count()).toBe(1);
    await expect.poll(() => card.count()).toBe(0);
    expect(errors).toEqual([]);
    await page.close();
  });

  it('copies and moves a diagram to another project of the team from the project page', async () => {
    const { page, errors } = await watchedPage(context);
    await page.goto(diagramUrl);
    await page.getByRole('heading', { name: 'Office bank' }).waitFor();
    const projectId = await page.evaluate(async (id) => (await (await fetch(`/api/diagrams/${id}`)).json()).diagram.projectId as string, diagramId);
    const target = await page.evaluate(async (pid) => {
      const teamId = (await (await fetch(`/api/projects/${pid}`)).json()).project.teamId;
      const res = await fetch('/api/projects', { method: 'POST', headers: { 'Content-Type': 'application/json' }, body: JSON.stringify({ teamId, name: 'Quarry workshop' }) });
      return (await res.json()).project.id as string;
    }, projectId);
    await page.goto(`${server.url}/projects/${projectId}`);
    await page.getByRole('button', { name: 'Move or copy Office bank' }).click();
    await page.getByRole('menuitem', { name: 'Copy to a project…' }).click();
    const dialog = page.getByRole('dialog', { name: 'Copy to a project' });
    await dialog.getByLabel('Project').selectOption(target);
    await shot(page, '08-copy-to-project');
    await dialog.getByRole('button', { name: 'Copy and open' }).click();
    await page.getByRole('heading', { name: 'Office bank (copy)' }).waitFor();
    const copyId = page.url().split('/').pop()!;
    await page.goto(`${server.url}/projects/${target}`);
    await page.getByRole('list', { name: 'Diagrams' }).getByRole('link', { name: 'Office bank (copy)' }).waitFor();

    // Move the copy back to the first project: it keeps its id.
    await page.getByRole('button', { name: 'Move or copy Office bank (copy)' }).click();
    await page.getByRole('menuitem', { name: 'Move to another project…' }).click();
    const move = page.getByRole('dialog', { name: 'Move to another project' });
    await move.getByLabel('Project').selectOption(projectId);
    await move.getByRole('button', { name: 'Move', exact: true }).click();
    await expect.poll(() => page.getByRole('list', { name: 'Diagrams' }).getByRole('link', { name: 'Office bank (copy)' }).count()).toBe(0);
    await page.goto(`${server.url}/projects/${projectId}`);
    await page.getByRole('list', { name: 'Diagrams' }).getByRole('link', { name: 'Office bank (copy)' }).waitFor();
    expect(await page.getByRole('list', { name: 'Diagrams' }).getByRole('link', { name: 'Office bank (copy)' }).getAttribute('href')).toBe(`/diagrams/${copyId}`);
    expect(errors).toEqual([]);
    await page.close();
  });

  it('an edit made ~50 ms before the tab closes is there when the diagram is opened again', async () => {
    const { page, errors } = await watchedPage(context);
    await page.goto(diagramUrl);
    await page.getByRole('heading', { name: 'Office bank' }).waitFor();
    const before = await page.locator('.react-flow__node').count();
    // As when the browser quits: no request from here on reaches the server, so only what the edit
    // itself wrote in this browser can survive.
    await context.setOffline(true);
    // The click and, in the same task, a read of this browser's copy: the edit is written before any
    // timer or unload handler could run.
    const keptAtOnce = await page.evaluate((id) => {
      const button = Array.from(document.querySelectorAll<HTMLButtonElement>('nav[aria-label="Parts palette"] button')).find((b) => b.textContent?.startsWith('Note'));
      button!.click();
      const raw = window.localStorage.getItem(`bankwright:working-copy:${id}`);
      return raw ? (JSON.parse(raw).doc.parts as { type: string }[]).filter((p) => p.type === 'note').length : -1;
    }, diagramId);
    expect(keptAtOnce).toBe(1);
    await page.waitForTimeout(50);
    await page.close();
    expect(errors).toEqual([]);

    await context.setOffline(false);
    const again = await watchedPage(context);
    await again.page.goto(`${server.url}/`);
    // Nothing reached the server.
    expect((await workingCopyParts(again.page, diagramId)).filter((t) => t === 'note')).toHaveLength(0);
    await again.page.goto(diagramUrl);
    await again.page.getByRole('heading', { name: 'Office bank' }).waitFor();
    await expect.poll(() => again.page.locator('.react-flow__node').count()).toBe(before + 1);
    await expect.poll(() => again.page.locator('.react-flow__node-note').count()).toBe(1);
    // The server copy was older: the copy from this browser was restored, with a notice, and is saved now.
    await again.page.getByText(/Restored changes kept on this device/).waitFor();
    await shot(again.page, '04-restored-after-close');
    await expect.poll(async () => (await workingCopyParts(again.page, diagramId)).filter((t) => t === 'note').length, { timeout: 15_000 }).toBe(1);
    expect(again.errors).toEqual([]);
    await again.page.close();
  });

  it('an edit made just before the tab closes reaches the server (keepalive), seen from another browser profile', async () => {
    const { page, errors } = await watchedPage(context);
    await page.goto(diagramUrl);
    await page.getByRole('heading', { name: 'Office bank' }).waitFor();
    await page.getByRole('status').filter({ hasText: /^Saved$/ }).waitFor({ timeout: 15_000 });
    const partsBefore = (await workingCopyParts(page, diagramId)).length;
    await page.getByRole('navigation', { name: 'Parts palette' }).getByRole('button', { name: /^Lug / }).click();
    await page.waitForTimeout(50);
    await page.close({ runBeforeUnload: true }); // pagehide runs: the copy is sent with keepalive
    expect(errors).toEqual([]);

    // A different profile (no copy in its storage) sees the lug on the server.
    const other = await browser.newContext({ viewport: { width: 1440, height: 900 } });
    const fresh = await watchedPage(other);
    await signIn(fresh.page, server.url, 'designer@demo.test');
    await fresh.page.waitForURL(/\/projects/);
    await expect.poll(async () => (await workingCopyParts(fresh.page, diagramId)).length, { timeout: 10_000 }).toBe(partsBefore + 1);
    await fresh.page.goto(diagramUrl);
    await fresh.page.getByRole('heading', { name: 'Office bank' }).waitFor();
    await expect.poll(() => fresh.page.locator('.react-flow__node-lug').count()).toBe(1);
    await shot(fresh.page, '05-server-copy-after-close');
    expect(fresh.errors).toEqual([]);
    await other.close();
    await context.close();
  });
});
