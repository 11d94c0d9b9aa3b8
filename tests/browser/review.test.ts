/**
 * Review flow in chromium against a real server with demo data: the demo designer moves the negative
 * take-off of the post-to-post demo diagram to another battery and saves a revision (through the API
 * with the designer's browser session: the editor does not mount a "Save revision" button yet), then
 * asks the demo reviewer for a review from the compare view. The reviewer opens the compare view, sees
 * the batteries' shares change in the results table, and approves. The owner's outbox holds the notices.
 */
import type { Browser, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
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

async function newPage(): Promise<Page> {
  const context = await browser.newContext({ viewport: { width: 1440, height: 900 } });
  return context.newPage();
}

interface Cable { id: string; from: { part: string; terminal: string }; to: { part: string; terminal: string } }

describe('review and sign-off in chromium', () => {
  it('designer saves a changed take-off, reviewer compares and approves, owner sees the notices', async () => {
    const url = server.url;
    const mutate = { Origin: url, 'Content-Type': 'application/json' };

    // Designer: find the demo diagram on the project page.
    const designer = await newPage();
    await signIn(designer, url, 'designer@demo.test');
    await designer.waitForURL(/\/teams\/[^/]+\/projects/, { timeout: 30_000 });
    await designer.getByText('Gannet Island ranger station').first().click();
    const card = designer.getByRole('list', { name: 'Diagrams' }).getByRole('link', { name: 'Post-to-post bank, end take-off' });
    await card.waitFor({ timeout: 30_000 });
    const diagramId = (await card.getAttribute('href'))!.split('/').pop()!;

    // Change the take-off: the main negative leaves from battery 3 instead of where it is now.
    const revisions = (await (await designer.request.get(`${url}/api/diagrams/${diagramId}/revisions`)).json()).revisions as { number: number }[];
    const base = revisions[0]?.number ?? null;
    const baseContent = base
      ? (await (await designer.request.get(`${url}/api/diagrams/${diagramId}/revisions/${base}`)).json()).revision.content
      : (await (await designer.request.get(`${url}/api/diagrams/${diagramId}`)).json()).diagram.content;
    const negBefore = (baseContent.cables as Cable[]).find((c) => c.id === 'c-main-neg')!.from.part;
    const negAfter = negBefore === 'bat3' ? 'bat2' : 'bat3';
    const changed = { ...baseContent, cables: (baseContent.cables as Cable[]).map((c) => (c.id === 'c-main-neg' ? { ...c, from: { part: negAfter, terminal: 'neg' } } : c)) };
    const saved = await designer.request.post(`${url}/api/diagrams/${diagramId}/revisions`, { headers: mutate, data: { baseRevision: base, message: `Negative take-off moved to ${negAfter}`, content: changed } });
    expect(saved.status()).toBe(201);
    const n = (await saved.json()).revision.number as number;
    expect(n).toBe((base ?? 0) + 1);

    // Designer asks the reviewer from the compare view of the new revision.
    await designer.goto(`${url}/diagrams/${diagramId}/history`);
    await designer.getByTestId(`revision-${n}`).getByRole('link', { name: /Compare with/ }).click();
    await designer.getByRole('list', { name: 'Changes' }).waitFor({ timeout: 30_000 });
    expect(await designer.getByRole('list', { name: 'Changes' }).innerText()).toContain(`Reconnected ${negBefore}.neg → ${negAfter}.neg`);
    await designer.getByRole('button', { name: 'Request review…' }).click();
    await designer.getByRole('dialog').getByLabel(/reviewer@demo\.test/).check();
    await designer.getByRole('button', { name: /Send review request/ }).click();
    await designer.getByRole('dialog').waitFor({ state: 'detached' });
    await designer.getByText('Asked: Priya Halvorsen').waitFor();
    await designer.context().close();

    // Reviewer: the shared compare link, the share change in the table, approve.
    const reviewer = await newPage();
    await signIn(reviewer, url, 'reviewer@demo.test');
    await reviewer.waitForURL(/\/teams\//, { timeout: 30_000 });
    await reviewer.goto(`${url}/diagrams/${diagramId}/compare?a=${n - 1}&b=${n}`);
    const table = reviewer.getByRole('table', { name: 'Battery currents and shares' });
    await table.waitFor({ timeout: 30_000 });
    // Moving the negative take-off changes which batteries sit on the short path: their shares move.
    const deltas = await reviewer.locator('[data-testid^="share-delta-"]').allInnerTexts();
    expect(deltas).toHaveLength(4);
    expect(deltas.some((d) => /^[+−]\d/.test(d) && d !== '±0.0 pts')).toBe(true);
    await reviewer.screenshot({ path: screenshotPath('review-compare'), fullPage: true });
    await reviewer.getByLabel(/Note to the designer/).fill('Shares checked against the previous revision.');
    await reviewer.getByRole('button', { name: `✓ Approve revision ${n}` }).click();
    await reviewer.getByText('Approved and locked.').waitFor({ timeout: 15_000 });
    await reviewer.context().close();

    // Owner: the notices went out (review request to the reviewer, decision to the designer).
    const owner = await newPage();
    await signIn(owner, url, 'owner@demo.test');
    await owner.waitForURL(/\/teams\/[^/]+\/projects/, { timeout: 30_000 });
    const teamId = owner.url().split('/teams/')[1].split('/')[0];
    const outbox = (await (await owner.request.get(`${url}/api/teams/${teamId}/outbox`)).json()).messages as { to: string; subject: string }[];
    expect(outbox).toEqual(expect.arrayContaining([
      expect.objectContaining({ to: 'reviewer@demo.test', subject: `Review requested: Post-to-post bank, end take-off revision ${n}` }),
      expect.objectContaining({ to: 'designer@demo.test', subject: `Approved: Post-to-post bank, end take-off revision ${n}` }),
    ]));
    await owner.goto(`${url}/teams/${teamId}/outbox`);
    await owner.getByText(`Approved: Post-to-post bank, end take-off revision ${n}`).first().waitFor({ timeout: 15_000 });
    await owner.context().close();
  });
});
