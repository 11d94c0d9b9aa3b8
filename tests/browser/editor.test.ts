/**
 * The diagram editor end to end: a designer builds a 4-battery post-to-post bank from the palette,
 * wires it by dragging between terminals, reads the current shares, moves the positive lead from the
 * first battery to the last and sees the imbalance fall; the working copy survives a reload.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Browser, Page } from 'playwright-core';
import { launchBrowser, screenshotPath, signIn, startServer, type RunningServer } from './support';

let server: RunningServer;
let browser: Browser;

beforeAll(async () => {
  server = await startServer();
  browser = await launchBrowser();
});

afterAll(async () => {
  await browser?.close();
  await server?.stop();
});

async function newDiagram(page: Page): Promise<string> {
  return page.evaluate(async () => {
    const me = await (await fetch('/api/auth/me')).json();
    const { projects } = await (await fetch(`/api/projects?teamId=${me.teams[0].id}`)).json();
    const res = await fetch(`/api/projects/${projects[0].id}/diagrams`, {
      method: 'POST',
      headers: { 'Content-Type': 'application/json' },
      body: JSON.stringify({ name: 'Browser test bank' }),
    });
    if (res.status !== 201) throw new Error(`create diagram answered ${res.status}`);
    return (await res.json()).diagram.id as string;
  });
}

const handle = (page: Page, part: string, terminal: string) =>
  page.locator(`.react-flow__node[data-id="${part}"] .react-flow__handle[data-handleid="${terminal}"]`);

async function connect(page: Page, from: [string, string], to: [string, string]) {
  const a = await handle(page, ...from).boundingBox();
  const b = await handle(page, ...to).boundingBox();
  if (!a || !b) throw new Error(`terminal not on screen: ${from.join('.')} or ${to.join('.')}`);
  await page.mouse.move(a.x + a.width / 2, a.y + a.height / 2);
  await page.mouse.down();
  await page.mouse.move((a.x + b.x) / 2, (a.y + b.y) / 2 - 20, { steps: 5 });
  await page.mouse.move(b.x + b.width / 2, b.y + b.height / 2, { steps: 5 });
  await page.mouse.up();
}

async function imbalance(page: Page): Promise<number> {
  const text = await page.getByTestId('imbalance').textContent();
  const m = /([\d.]+)\s*%/.exec(text ?? '');
  if (!m) throw new Error(`no imbalance figure in "${text}"`);
  return Number(m[1]);
}

describe('diagram editor', () => {
  it('builds a post-to-post bank, shows shares, and a diagonal take-off lowers the imbalance', async () => {
    const page = await browser.newPage({ viewport: { width: 1440, height: 900 } });
    await signIn(page, server.url, 'designer@demo.test');
    await page.waitForURL(/\/projects/);
    const id = await newDiagram(page);
    await page.goto(`${server.url}/diagrams/${id}`);
    await page.getByRole('heading', { name: 'Browser test bank' }).waitFor();
    await page.getByRole('button', { name: 'Dismiss the safety note' }).click();

    // Drop 4 batteries and an inverter from the palette onto the canvas.
    const canvas = (await page.locator('.bw-canvas').boundingBox())!;
    const y = canvas.y + canvas.height / 2;
    for (let i = 0; i < 4; i++) {
      await page.getByRole('button', { name: /^Battery / }).dragTo(page.locator('.bw-canvas'), {
        targetPosition: { x: 120 + i * 170, y: y - canvas.y },
      });
    }
    await page.getByRole('button', { name: /^Inverter / }).dragTo(page.locator('.bw-canvas'), {
      targetPosition: { x: 120 + 4 * 170 + 60, y: y - canvas.y - 160 },
    });
    await expect.poll(() => page.locator('.react-flow__node').count()).toBe(5);

    // Jumpers post to post, then both leads from battery 1 (same-end take-off).
    for (let i = 1; i < 4; i++) {
      await connect(page, [`bat${i}`, 'pos'], [`bat${i + 1}`, 'pos']);
      await connect(page, [`bat${i}`, 'neg'], [`bat${i + 1}`, 'neg']);
    }
    await connect(page, ['bat1', 'pos'], ['inv1', 'pos']);
    await connect(page, ['bat1', 'neg'], ['inv1', 'neg']);
    await page.screenshot({ path: screenshotPath('editor-wired') });
    await expect.poll(() => page.locator('.react-flow__edge').count()).toBe(8);

    // Shares appear on every battery; battery 1 (nearest the take-off) carries the most.
    await page.getByTestId('share-bat4').waitFor();
    const share = async (n: number) => Number(/([\d.]+)\s*%/.exec((await page.getByTestId(`share-bat${n}`).textContent()) ?? '')![1]);
    const shares = [await share(1), await share(2), await share(3), await share(4)];
    expect(shares[0]).toBeGreaterThan(shares[3]);
    const sameEnd = await imbalance(page);
    expect(sameEnd).toBeGreaterThan(5);
    await page.screenshot({ path: screenshotPath('editor-same-end') });

    // Move the positive lead from the first battery to the last (diagonal take-off).
    const lead = await page.evaluate(() => {
      const labels = [...document.querySelectorAll<HTMLElement>('.bw-cable-label')];
      return labels.map((l) => l.dataset.cableId!);
    });
    expect(lead.length).toBe(8);
    await page.locator('.bw-cable-label').nth(6).dispatchEvent('click');
    const from = page.getByLabel('From', { exact: true });
    const to = page.getByLabel('To', { exact: true });
    // The 7th cable drawn is battery 1 + to the inverter +.
    expect(await from.locator('option:checked').textContent()).toMatch(/Battery 1 · \+/);
    expect(await to.locator('option:checked').textContent()).toMatch(/Inverter 1 · \+/);
    await from.selectOption({ label: 'Battery 4 · + (positive)' });
    await expect.poll(() => imbalance(page)).toBeLessThan(sameEnd / 2);
    await page.screenshot({ path: screenshotPath('editor-diagonal') });

    // A props edit and a label edit show on the part's node at once, and undo takes them back.
    const node2 = page.locator('.react-flow__node[data-id="bat2"]');
    await node2.focus();
    await page.keyboard.press('Enter');
    await page.getByLabel('Capacity', { exact: true }).fill('280');
    await expect.poll(() => node2.locator('.bw-part-caption').textContent()).toMatch(/280 Ah/);
    await page.getByLabel('Label', { exact: true }).fill('Battery 2 (spare)');
    await expect.poll(() => node2.locator('.bw-part-name').textContent()).toBe('Battery 2 (spare)');
    await page.locator('.bw-canvas .react-flow__pane').click({ position: { x: 5, y: 5 } });
    await page.keyboard.press('Control+z');
    await expect.poll(() => node2.locator('.bw-part-name').textContent()).not.toBe('Battery 2 (spare)');
    await page.keyboard.press('Control+z');
    await expect.poll(() => node2.locator('.bw-part-caption').textContent()).not.toMatch(/280 Ah/);

    // The working copy is saved and opens again after a reload.
    await expect.poll(() => page.locator('.bw-save').textContent(), { timeout: 10_000 }).toBe('Saved');
    await page.reload();
    await expect.poll(() => page.locator('.react-flow__edge').count(), { timeout: 15_000 }).toBe(8);
    await page.getByTestId('share-bat4').waitFor();
    await page.close();
  });

  it('opens read-only for a viewer: no palette, disabled fields', async () => {
    const page = await browser.newPage({ viewport: { width: 1280, height: 800 } });
    await signIn(page, server.url, 'viewer@demo.test');
    await page.waitForURL(/\/projects/);
    const id = await page.evaluate(async () => {
      const me = await (await fetch('/api/auth/me')).json();
      const { projects } = await (await fetch(`/api/projects?teamId=${me.teams[0].id}`)).json();
      const { diagrams } = await (await fetch(`/api/projects/${projects[0].id}/diagrams`)).json();
      return diagrams[0].id as string;
    });
    await page.goto(`${server.url}/diagrams/${id}`);
    await page.getByText(/Read only/).first().waitFor();
    expect(await page.getByRole('navigation', { name: 'Parts palette' }).count()).toBe(0);
    expect(await page.getByLabel('System voltage').isDisabled()).toBe(true);
    await page.close();
  });
});
