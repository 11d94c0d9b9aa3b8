/**
 * Every demo role signs in in a real browser (Debian's chromium) and sees only what its role allows.
 * The designer's project list is saved as a screenshot in test-results/.
 */
import type { Browser } from 'playwright-core';
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

// What each role should see, written out from the role table in the foundation issue
// (owner: everything; designer: create and edit projects; reviewer, trainer, viewer: no project edits).
const EXPECT = {
  owner: { newProject: true, outbox: true, invite: true },
  designer: { newProject: true, outbox: false, invite: false },
  reviewer: { newProject: false, outbox: false, invite: false },
  trainer: { newProject: false, outbox: false, invite: false },
  viewer: { newProject: false, outbox: false, invite: false },
} as const;

describe('demo roles in chromium', () => {
  for (const [role, sees] of Object.entries(EXPECT)) {
    it(`${role} signs in and sees only what the role allows`, async () => {
      const context = await browser.newContext({ viewport: { width: 1280, height: 800 } });
      const page = await context.newPage();
      try {
        await signIn(page, server.url, `${role}@demo.test`);
        await page.waitForURL(/\/teams\/[^/]+\/projects/, { timeout: 30_000 });
        await expect(page.getByText('Gannet Island ranger station').first().waitFor({ timeout: 30_000 })).resolves.toBeUndefined();

        expect(await page.getByRole('button', { name: /new project/i }).count()).toBe(sees.newProject ? 1 : 0);
        expect(await page.getByRole('link', { name: /outbox/i }).count()).toBe(sees.outbox ? 1 : 0);
        if (role === 'designer') await page.screenshot({ path: screenshotPath('project-list-designer'), fullPage: true });

        await page.getByRole('link', { name: /members/i }).first().click();
        await page.getByText('owner@demo.test').first().waitFor({ timeout: 15_000 });
        expect(await page.getByText(/invite by e-mail/i).count()).toBe(sees.invite ? 1 : 0);
      } finally {
        await context.close();
      }
    });
  }
});
