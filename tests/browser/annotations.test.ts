/**
 * The annotation layer end to end in chromium against a real server with demo data: the demo trainer
 * opens a demo diagram (read only electrically: no palette), pins a callout to a battery through the
 * annotations panel, the save goes through PUT /api/diagrams/:id/annotations, and the callout is there
 * after a reload while the diagram's parts and cables are exactly as before. A viewer sees the callout
 * but gets no way to add one, and the server refuses one sent anyway.
 */
import type { Browser, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { launchBrowser, screenshotPath, signIn, startServer, type RunningServer } from './support';

const DIAGRAM = 'Busbar bank, unequal cables';
const CALLOUT = 'Crew briefing: isolate this battery at its fuse before work';

let server: RunningServer;
let browser: Browser;
let diagramId: string;

beforeAll(async () => {
  server = await startServer();
  browser = await launchBrowser();
});

afterAll(async () => {
  await browser?.close();
  await server?.stop();
});

async function signedIn(email: string): Promise<Page> {
  const context = await browser.newContext({ viewport: { width: 1440, height: 900 } });
  const page = await context.newPage();
  await signIn(page, server.url, email);
  await page.waitForURL(/\/teams\/[^/]+\/projects/, { timeout: 30_000 });
  return page;
}

async function findDiagram(page: Page): Promise<string> {
  return page.evaluate(async (name) => {
    const me = await (await fetch('/api/auth/me')).json();
    const { projects } = await (await fetch(`/api/projects?teamId=${me.teams[0].id}`)).json();
    for (const p of projects) {
      const { diagrams } = await (await fetch(`/api/projects/${p.id}/diagrams`)).json();
      const d = diagrams.find((x: { name: string }) => x.name === name);
      if (d) return d.id as string;
    }
    throw new Error('demo diagram not found');
  }, DIAGRAM);
}

/** The working copy as the server has it. */
async function stored(page: Page) {
  const res = await page.request.get(`${server.url}/api/diagrams/${diagramId}`);
  expect(res.status()).toBe(200);
  return (await res.json()).diagram as { content: { parts: unknown[]; cables: unknown[]; annotations: { kind: string; partId?: string; text?: string }[] }; workingCopyVersion: number };
}

async function openEditor(page: Page) {
  await page.goto(`${server.url}/diagrams/${diagramId}`);
  await page.getByRole('heading', { name: DIAGRAM }).waitFor({ timeout: 60_000 });
  await page.locator('.react-flow__node').first().waitFor();
}

async function openAnnotations(page: Page, item: string) {
  await page.getByRole('button', { name: 'Annotations', exact: true }).click();
  await page.getByRole('menuitem', { name: item }).click();
  return page.getByRole('region', { name: 'Annotations' });
}

describe('annotations in chromium', () => {
  it('a trainer adds a callout through the annotations route; it is there after a reload', async () => {
    const page = await signedIn('trainer@demo.test');
    diagramId = await findDiagram(page);
    const before = await stored(page);

    await openEditor(page);
    await page.getByRole('button', { name: 'Dismiss the safety note' }).click();
    await page.getByText('Read only (Trainer)').waitFor();
    expect(await page.getByRole('navigation', { name: 'Parts palette' }).count()).toBe(0);

    // Select battery 3 on the canvas, then a callout pinned to it.
    await page.locator('.react-flow__node[data-id="bat3"]').click();
    const panel = await openAnnotations(page, 'Edit annotations…');
    await panel.getByRole('button', { name: '+ Callout' }).click();
    const form = panel.getByRole('form', { name: 'New callout' });
    expect(await form.getByRole('combobox').locator('option:checked').textContent()).toBe('Battery 3');
    await form.getByRole('textbox').fill(CALLOUT);
    const put = page.waitForResponse((r) => r.url().endsWith(`/api/diagrams/${diagramId}/annotations`) && r.request().method() === 'PUT');
    await form.getByRole('button', { name: 'Add' }).click();
    await page.locator('.bw-ann-callout', { hasText: CALLOUT }).waitFor();
    const res = await put;
    expect(res.status()).toBe(200);
    expect(Object.keys(res.request().postDataJSON()).sort()).toEqual(['annotations', 'baseVersion']);
    await panel.getByRole('status').filter({ hasText: 'Annotations saved' }).waitFor({ timeout: 15_000 });
    await page.screenshot({ path: screenshotPath('annotations-trainer-callout') });

    // The server holds the callout on battery 3; parts and cables are exactly as they were.
    const after = await stored(page);
    expect(after.content.annotations).toEqual(expect.arrayContaining([expect.objectContaining({ kind: 'callout', partId: 'bat3', text: CALLOUT })]));
    expect(after.content.parts).toEqual(before.content.parts);
    expect(after.content.cables).toEqual(before.content.cables);
    expect(after.workingCopyVersion).toBe(before.workingCopyVersion + 1);

    await page.reload();
    await page.getByRole('heading', { name: DIAGRAM }).waitFor({ timeout: 60_000 });
    await page.locator('.bw-ann-callout', { hasText: CALLOUT }).waitFor({ timeout: 15_000 });
    await page.context().close();
  });

  it('a viewer sees the callout but cannot add one', async () => {
    expect(diagramId, 'the trainer test runs first').toBeTruthy();
    const page = await signedIn('viewer@demo.test');
    await openEditor(page);
    await page.locator('.bw-ann-callout', { hasText: CALLOUT }).waitFor({ timeout: 15_000 });

    await page.getByRole('button', { name: 'Annotations', exact: true }).click();
    expect(await page.getByRole('menuitem', { name: 'Edit annotations…' }).count()).toBe(0);
    await page.getByRole('menuitem', { name: 'List annotations…' }).click();
    const panel = page.getByRole('region', { name: 'Annotations' });
    await panel.getByRole('list', { name: 'Annotation list' }).getByText(CALLOUT).waitFor();
    expect(await panel.getByRole('button', { name: '+ Callout' }).count()).toBe(0);
    expect(await panel.getByRole('button', { name: /^(Edit|Delete) callout/ }).count()).toBe(0);

    // Sent anyway with the viewer's session: refused, nothing stored.
    const before = await stored(page);
    const refused = await page.request.put(`${server.url}/api/diagrams/${diagramId}/annotations`, {
      headers: { Origin: server.url, 'Content-Type': 'application/json' },
      data: { baseVersion: before.workingCopyVersion, annotations: [...before.content.annotations, { id: 'callout99', kind: 'callout', partId: 'bat1', text: 'viewer' }] },
    });
    expect(refused.status()).toBe(403);
    expect((await stored(page)).content.annotations).toEqual(before.content.annotations);
    await page.context().close();
  });
});
