/**
 * Review flow in chromium against a real server with demo data, all through the interface: the demo
 * designer opens the post-to-post demo diagram in the editor, moves the positive take-off (the battery
 * to main fuse cable) to another battery with the cable's From picker, waits for the working copy to be
 * saved, saves a revision from the toolbar, and asks the demo reviewer for a review from the history's
 * compare view. The reviewer opens the compare view, sees the batteries' shares change in the results
 * table (checked against the currents the editor showed before and after the move), and approves. The
 * owner's outbox holds the notices.
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

const BATTERIES = ['bat1', 'bat2', 'bat3', 'bat4'];

/** A battery's figures as the editor's canvas shows them under the battery ("41.9 A · 26 %"). */
interface Shown { current_A: number; share_pct: number }

async function editorFigures(page: Page): Promise<Record<string, Shown>> {
  const out: Record<string, Shown> = {};
  for (const id of BATTERIES) {
    const strip = page.getByTestId(`share-${id}`);
    expect(await strip.getAttribute('data-mode')).toBe('load');
    const text = (await strip.textContent()) ?? '';
    const m = /([\d.]+)\s*A\s*·\s*([\d.]+)\s*%/.exec(text);
    if (!m) throw new Error(`no current and share for ${id} in "${text}"`);
    out[id] = { current_A: Number(m[1]), share_pct: Number(m[2]) };
  }
  return out;
}

/** "−3.2 pts" / "+0.4 pts" / "±0 pts" → signed number. */
const signedNumber = (t: string) => (t.startsWith('±') ? 0 : Number(t.replace('−', '-').replace('+', '').replace(/[^\d.-]/g, '')));

describe('review and sign-off in chromium', () => {
  it('designer saves a changed take-off, reviewer compares and approves, owner sees the notices', async () => {
    const url = server.url;

    // Designer: find the demo diagram on the project page and open it in the editor.
    const designer = await newPage();
    await signIn(designer, url, 'designer@demo.test');
    await designer.waitForURL(/\/teams\/[^/]+\/projects/, { timeout: 30_000 });
    await designer.getByRole('list', { name: 'Projects' }).getByText('Gannet Island ranger station').first().click();
    const card = designer.getByRole('list', { name: 'Diagrams' }).getByRole('link', { name: 'Post-to-post bank, end take-off' });
    await card.waitFor({ timeout: 30_000 });
    const diagramId = (await card.getAttribute('href'))!.split('/').pop()!;
    await card.click();
    await designer.waitForURL(new RegExp(`/diagrams/${diagramId}$`));
    await designer.getByRole('button', { name: 'Dismiss the safety note' }).click();
    await designer.getByTestId('share-bat4').waitFor({ timeout: 60_000 }); // live results are in
    const before = await editorFigures(designer);

    // The positive take-off: the cable from a battery's + to the main fuse. Move its battery end.
    await designer.locator('.bw-cable-label[data-cable-id="c-main-fuse"]').dispatchEvent('click');
    await designer.getByRole('heading', { name: 'Cable: Battery to main fuse' }).waitFor();
    const from = designer.getByLabel('From', { exact: true });
    const fromBefore = (await from.locator('option:checked').textContent()) ?? '';
    const m = /^Battery (\d) · \+ \(positive\)$/.exec(fromBefore);
    expect(m, `the positive take-off starts at a battery's +, not "${fromBefore}"`).not.toBeNull();
    const posBefore = Number(m![1]);
    const posAfter = posBefore === 3 ? 2 : 3;
    await from.selectOption({ label: `Battery ${posAfter} · + (positive)` });
    expect(await from.locator('option:checked').textContent()).toBe(`Battery ${posAfter} · + (positive)`);

    // New live results: wait until the battery figures change and settle, then the working copy is saved.
    await expect.poll(async () => JSON.stringify(await editorFigures(designer)) !== JSON.stringify(before), { timeout: 30_000 }).toBe(true);
    await expect.poll(() => designer.getByText('Computing…').count()).toBe(0);
    const after = await editorFigures(designer);
    await expect.poll(() => designer.locator('.bw-save').textContent(), { timeout: 15_000 }).toBe('Saved');

    // Save revision from the toolbar: the dialog names the next number and asks what changed.
    await designer.getByRole('button', { name: 'Save revision…' }).click();
    const saveDialog = designer.getByRole('dialog');
    const saveButton = saveDialog.getByRole('button', { name: /^Save revision \d+$/ });
    const n = Number(/(\d+)$/.exec((await saveButton.textContent())!.trim())![1]);
    expect(n).toBeGreaterThan(1);
    const message = `Positive take-off moved to battery ${posAfter}`;
    await saveDialog.getByLabel('What changed').fill(message);
    await saveButton.click();
    await saveDialog.waitFor({ state: 'detached', timeout: 30_000 });

    // Designer asks the reviewer from the compare view of the new revision, reached from the history.
    await designer.getByRole('link', { name: 'History', exact: true }).click();
    const row = designer.getByTestId(`revision-${n}`);
    await row.waitFor({ timeout: 30_000 });
    expect(await row.innerText()).toContain(message);
    await row.getByRole('link', { name: `Compare with r${n - 1}` }).click();
    await designer.getByRole('list', { name: 'Changes' }).waitFor({ timeout: 30_000 });
    expect(await designer.getByRole('list', { name: 'Changes' }).innerText()).toContain(`Reconnected bat${posBefore}.pos → bat${posAfter}.pos`);
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
    // Columns: battery | A current | A share | B current | B share | Δ current | Δ share.
    const total = (f: Record<string, Shown>) => BATTERIES.reduce((s, id) => s + f[id].current_A, 0);
    let moved = 0;
    for (const id of BATTERIES) {
      const cells = await table.getByTestId(`share-row-${id}`).locator('td').allInnerTexts();
      expect(cells).toHaveLength(6);
      const [aI, aS, bI, bS, , dS] = cells;
      // The revisions' currents are the ones the editor showed before and after the move (0.1 A shown).
      expect(Math.abs(Number.parseFloat(aI) - before[id].current_A)).toBeLessThanOrEqual(0.11);
      expect(Math.abs(Number.parseFloat(bI) - after[id].current_A)).toBeLessThanOrEqual(0.11);
      // Shares (0.1 % in the table) round to the whole percent the editor showed.
      expect(Math.abs(Number.parseFloat(aS) - before[id].share_pct)).toBeLessThanOrEqual(0.51);
      expect(Math.abs(Number.parseFloat(bS) - after[id].share_pct)).toBeLessThanOrEqual(0.51);
      // Δ share against the editor's figures: each battery's current over the bank's, after minus before.
      const fromEditor = 100 * (after[id].current_A / total(after) - before[id].current_A / total(before));
      expect(Math.abs(signedNumber(dS) - fromEditor)).toBeLessThanOrEqual(0.25);
      if (Math.abs(fromEditor) >= 1) moved++;
    }
    // Moving the positive take-off changes which batteries sit on the short path: their shares move.
    expect(moved).toBeGreaterThan(0);
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
