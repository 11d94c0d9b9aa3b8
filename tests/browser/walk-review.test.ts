/**
 * The review walk in chromium on a server without SMTP, keyboard-first: a designer saves revisions and
 * requests review from the editor's toolbar; the reviewer finds the request on the landing page and in the
 * notification list, opens the compare view from the notice, comments and approves; the designer is told;
 * the owner switches the team to US units and the canvas labels show AWG and feet, while the designer's own
 * choice of metric keeps mm² on their screens. Every step checks that nothing on the page threw.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Browser, Page } from 'playwright-core';
import { postToPostTemplate } from '@shared/diagram';
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

/** A signed-in page in its own context, recording errors thrown on it. */
async function signedIn(email: string): Promise<{ page: Page; errors: string[] }> {
  const context = await browser.newContext({ viewport: { width: 1440, height: 900 } });
  const page = await context.newPage();
  const errors: string[] = [];
  page.on('pageerror', (e) => errors.push(String(e)));
  await signIn(page, server.url, email);
  await page.waitForURL(/\/teams\/[^/]+\/projects/, { timeout: 30_000 });
  return { page, errors };
}

/** Focus a control and press a key: the step is taken from the keyboard. */
async function press(page: Page, locator: ReturnType<Page['getByRole']>, key = 'Enter') {
  await locator.focus();
  await page.keyboard.press(key);
}

const NAME = 'Walk bank';

/** The sizing assistant's text (Analysis tab), opened from the keyboard once its suggestions are in. */
async function sizingText(page: Page): Promise<string> {
  await press(page, page.getByRole('tab', { name: 'Analysis', exact: true }));
  await press(page, page.getByRole('button', { name: 'Sizing assistant' }));
  const region = page.getByRole('region', { name: 'Sizing assistant' });
  await region.getByText(/at least/).first().waitFor({ timeout: 30_000 });
  return region.innerText();
}

describe('the review walk', () => {
  it('designer requests review from the editor; reviewer is told in the app, compares, comments and approves; owner switches to US units', async () => {
    const url = server.url;

    // Designer: a new diagram from the post-to-post template, opened in the editor.
    const d = await signedIn('designer@demo.test');
    const diagramId = await d.page.evaluate(
      async ({ name, content }) => {
        const me = await (await fetch('/api/auth/me')).json();
        const { projects } = await (await fetch(`/api/projects?teamId=${me.teams[0].id}`)).json();
        const res = await fetch(`/api/projects/${projects[0].id}/diagrams`, { method: 'POST', headers: { 'Content-Type': 'application/json' }, body: JSON.stringify({ name, content }) });
        return (await res.json()).diagram.id as string;
      },
      { name: NAME, content: postToPostTemplate({ count: 4, takeOff: 'same-end' }) },
    );
    await d.page.goto(`${url}/diagrams/${diagramId}`);
    await d.page.getByTestId('share-bat4').waitFor({ timeout: 60_000 });

    // The toolbar's Request review… waits for a saved revision.
    const requestButton = d.page.getByRole('button', { name: 'Request review…' });
    expect(await requestButton.isDisabled()).toBe(true);

    const saveRevision = async (message: string) => {
      await press(d.page, d.page.getByRole('button', { name: 'Save revision…' }));
      const dialog = d.page.getByRole('dialog');
      // The field starts empty for each new revision (the last message is not carried over).
      await dialog.getByLabel('What changed').focus();
      expect(await dialog.getByLabel('What changed').inputValue()).toBe('');
      await d.page.keyboard.type(message);
      await press(d.page, dialog.getByRole('button', { name: /^Save revision \d+$/ }));
      await dialog.waitFor({ state: 'detached', timeout: 30_000 });
    };
    await saveRevision('First layout');

    // A change from the keyboard: select battery 1, type its internal resistance in ohms into the mΩ field.
    const bat1 = d.page.locator('.react-flow__node[data-id="bat1"]');
    await bat1.focus();
    await d.page.keyboard.press('Escape');
    await d.page.keyboard.press('Enter');
    const resistance = d.page.getByLabel('Internal resistance');
    await resistance.focus();
    await d.page.keyboard.press('Control+a');
    await d.page.keyboard.type('0.0035 Ω');
    await d.page.keyboard.press('Tab');
    expect(await resistance.inputValue()).toBe('3.5');
    await expect.poll(() => d.page.locator('.bw-save').textContent(), { timeout: 15_000 }).toBe('Saved');
    await saveRevision('Battery 1 measured at 3.5 mΩ');

    await expect.poll(() => requestButton.isDisabled(), { timeout: 15_000 }).toBe(false);
    await press(d.page, requestButton);
    const ask = d.page.getByRole('dialog', { name: 'Request review of revision 2' });
    await ask.waitFor();
    await press(d.page, ask.getByLabel(/reviewer@demo\.test/), 'Space');
    await press(d.page, ask.getByRole('button', { name: /Send review request/ }));
    await ask.waitFor({ state: 'detached' });
    await d.page.screenshot({ path: screenshotPath('walk-1-designer-requested') });
    expect(d.errors).toEqual([]);

    // Reviewer: the request waits on the landing page and in the notification list.
    const r = await signedIn('reviewer@demo.test');
    const waiting = r.page.getByRole('region', { name: 'Waiting for your review' });
    await waiting.getByRole('link', { name: `${NAME} · revision 2` }).waitFor({ timeout: 15_000 });
    expect(await waiting.getByRole('listitem').filter({ hasText: `${NAME} · revision 2` }).innerText()).toContain('“Battery 1 measured at 3.5 mΩ”');
    const bell = r.page.getByRole('button', { name: /^Notifications, \d+ unread$/ });
    await bell.waitFor({ timeout: 15_000 });
    const unreadBefore = Number(/(\d+) unread/.exec((await bell.getAttribute('aria-label')) ?? '')![1]);
    expect(unreadBefore).toBeGreaterThanOrEqual(1);
    await r.page.screenshot({ path: screenshotPath('walk-2-reviewer-landing') });
    await press(r.page, bell);
    const first = r.page.getByRole('menu').getByRole('menuitem').first();
    await first.waitFor();
    expect(await first.innerText()).toContain(`asked you to review ${NAME} revision 2`);
    await r.page.screenshot({ path: screenshotPath('walk-3-reviewer-notifications') });
    // The menu opened on its first item: Enter follows the notice to the compare view.
    await r.page.keyboard.press('Enter');
    await r.page.waitForURL(new RegExp(`/diagrams/${diagramId}/compare\\?a=1&b=2$`));
    await r.page.getByRole('list', { name: 'Changes' }).waitFor({ timeout: 30_000 });
    await expect.poll(async () => (await r.page.evaluate(async () => (await (await fetch('/api/notifications')).json()).unread)) as number).toBe(unreadBefore - 1);

    // Comment and approve from the keyboard.
    await r.page.locator('#comment-body').focus();
    await r.page.keyboard.type('Battery 1 reading matches the site log.');
    await press(r.page, r.page.getByRole('button', { name: 'Add comment' }));
    await r.page.getByRole('list', { name: 'Comment threads' }).getByText('Battery 1 reading matches the site log.').waitFor({ timeout: 15_000 });
    await r.page.getByLabel(/Note to the designer/).focus();
    await r.page.keyboard.type('Shares checked.');
    await press(r.page, r.page.getByRole('button', { name: '✓ Approve revision 2' }));
    await r.page.getByText('Approved and locked.').waitFor({ timeout: 15_000 });
    await r.page.screenshot({ path: screenshotPath('walk-4-reviewer-approved') });
    expect(r.errors).toEqual([]);

    // The designer is told in the app: the comment and the approval, and the landing page lists it.
    await d.page.goto(`${url}/`);
    await d.page.getByRole('region', { name: 'Recent approvals' }).getByRole('link', { name: `${NAME} · revision 2` }).waitFor({ timeout: 15_000 });
    const kinds = await d.page.evaluate(async (id) => {
      const { notifications } = await (await fetch('/api/notifications')).json();
      return (notifications as { kind: string; diagram: { id: string } }[]).filter((n) => n.diagram.id === id).map((n) => n.kind);
    }, diagramId);
    expect(kinds).toEqual(['approved', 'comment']);
    expect(d.errors).toEqual([]);

    // Owner: team settings to US units; the editor's cable labels show AWG and feet.
    const o = await signedIn('owner@demo.test');
    const teamId = o.page.url().split('/teams/')[1].split('/')[0];
    await o.page.goto(`${url}/teams/${teamId}/members`);
    const units = o.page.getByLabel('Units');
    await units.focus();
    await units.selectOption('us');
    await press(o.page, o.page.getByRole('button', { name: 'Save team units' }));
    await o.page.getByText('Saved: the team works in US customary units.').waitFor({ timeout: 15_000 });
    await o.page.goto(`${url}/diagrams/${diagramId}`);
    await o.page.getByTestId('share-bat4').waitFor({ timeout: 60_000 });
    // Zoom in (from the keyboard, on the canvas's zoom control) until the labels carry conductor and length.
    const zoomIn = o.page.getByRole('button', { name: /zoom in/i });
    for (let i = 0; i < 6 && (await o.page.locator('.bw-cable-label[data-detail="full"]').count()) === 0; i++) await press(o.page, zoomIn);
    await o.page.locator('.bw-cable-label[data-detail="full"]').first().waitFor();
    const labels = await o.page.locator('.bw-cable-label[data-detail="full"]').allInnerTexts();
    expect(labels.length).toBeGreaterThan(0);
    expect(labels.some((t) => /\bAWG\b/.test(t)), labels.join(' | ')).toBe(true);
    expect(labels.some((t) => /\d ft\b/.test(t)), labels.join(' | ')).toBe(true);
    expect(labels.some((t) => /mm²|\d m\b/.test(t)), labels.join(' | ')).toBe(false);
    await o.page.screenshot({ path: screenshotPath('walk-5-owner-us-units') });
    // Sizing suggests conductors from the US series.
    expect(await sizingText(o.page)).toMatch(/at least [\d/]+ (AWG|kcmil)/);
    expect(o.errors).toEqual([]);

    // The designer keeps metric on their own screens: Account → Units overrides the team's US setting.
    await d.page.goto(`${url}/account`);
    const mine = d.page.getByLabel('Units on your screens');
    await mine.focus();
    await mine.selectOption('metric');
    await press(d.page, d.page.getByRole('button', { name: 'Save units' }));
    await d.page.getByText('Saved.').waitFor();
    await d.page.goto(`${url}/diagrams/${diagramId}`);
    await d.page.getByTestId('share-bat4').waitFor({ timeout: 60_000 });
    const dZoomIn = d.page.getByRole('button', { name: /zoom in/i });
    for (let i = 0; i < 6 && (await d.page.locator('.bw-cable-label[data-detail="full"]').count()) === 0; i++) await press(d.page, dZoomIn);
    await d.page.locator('.bw-cable-label[data-detail="full"]').first().waitFor();
    const metricLabels = await d.page.locator('.bw-cable-label[data-detail="full"]').allInnerTexts();
    expect(metricLabels.some((t) => /mm²/.test(t)), metricLabels.join(' | ')).toBe(true);
    expect(metricLabels.some((t) => /AWG|\d ft\b/.test(t)), metricLabels.join(' | ')).toBe(false);
    // And sizing offers the metric series.
    const metricSizing = await sizingText(d.page);
    expect(metricSizing).toMatch(/at least [\d.]+ mm²/);
    expect(metricSizing).not.toMatch(/at least [\d/]+ (AWG|kcmil)/);
    await d.page.screenshot({ path: screenshotPath('walk-6-designer-metric-sizing') });
    expect(d.errors).toEqual([]);
  });
});
