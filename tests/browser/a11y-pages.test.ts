/**
 * Accessibility of every page of the app in chromium: axe-core finds no serious or critical violation on
 * each page, visited in turn as a signed-in owner (who sees every control), a designer and a reviewer, plus the
 * signed-out pages and the open notification list. Each page is also checked for errors thrown on it.
 */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Browser, Page } from 'playwright-core';
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

interface Ids {
  teamId: string;
  projectId: string;
  diagramId: string;
  revisions: number;
}

/** The demo team, its first project with a diagram of at least two revisions. */
async function demoIds(page: Page): Promise<Ids> {
  return page.evaluate(async () => {
    const me = await (await fetch('/api/auth/me')).json();
    const teamId = me.teams[0].id as string;
    const { projects } = await (await fetch(`/api/projects?teamId=${teamId}`)).json();
    for (const p of projects as { id: string }[]) {
      const { diagrams } = await (await fetch(`/api/projects/${p.id}/diagrams`)).json();
      const d = (diagrams as { id: string; latestRevision?: { number: number } | null }[]).find((x) => (x.latestRevision?.number ?? 0) >= 2);
      if (d) return { teamId, projectId: p.id, diagramId: d.id, revisions: d.latestRevision!.number };
    }
    throw new Error('no demo diagram with two revisions');
  });
}

/** Every page of the app with what marks it as loaded. */
function pagesOf(ids: Ids): { name: string; path: string; ready: (page: Page) => Promise<unknown> }[] {
  const { teamId, projectId, diagramId, revisions } = ids;
  const heading = (name: string | RegExp) => (page: Page) => page.getByRole('heading', { name }).first().waitFor();
  return [
    { name: 'projects', path: `/teams/${teamId}/projects`, ready: heading('Projects') },
    { name: 'project', path: `/projects/${projectId}`, ready: (page) => page.getByRole('heading', { level: 1 }).waitFor() },
    { name: 'parts library', path: `/teams/${teamId}/library`, ready: heading('Parts library') },
    { name: 'members', path: `/teams/${teamId}/members`, ready: heading('Members') },
    { name: 'mail', path: `/teams/${teamId}/outbox`, ready: heading(/Outbox|Your mail/) },
    { name: 'account', path: '/account', ready: heading('Account') },
    { name: 'editor', path: `/diagrams/${diagramId}`, ready: (page) => page.locator('.react-flow__node').first().waitFor() },
    { name: 'history', path: `/diagrams/${diagramId}/history`, ready: (page) => page.getByRole('cell', { name: `r${revisions}` }).first().waitFor() },
    { name: 'revision', path: `/diagrams/${diagramId}/revisions/${revisions}`, ready: (page) => page.locator('.react-flow__node').first().waitFor() },
    { name: 'compare', path: `/diagrams/${diagramId}/compare?a=${revisions - 1}&b=${revisions}`, ready: (page) => page.locator('.react-flow__node').first().waitFor() },
    { name: 'print', path: `/diagrams/${diagramId}/print`, ready: (page) => page.locator('.react-flow__node').first().waitFor() },
    { name: 'not found', path: '/no-such-page', ready: heading(/not found/i) },
  ];
}

async function visitAll(page: Page, label: string, found: string[]): Promise<void> {
  const errors: string[] = [];
  page.on('pageerror', (e) => errors.push(String(e)));
  const ids = await demoIds(page);
  for (const p of pagesOf(ids)) {
    await page.goto(`${server.url}${p.path}`);
    await p.ready(page);
    // Let lazy panels and the analysis settle before looking.
    await page.waitForTimeout(800);
    found.push(...(await seriousViolations(page)).map((v) => `[${label}: ${p.name}] ${v}`));
    if (errors.length > 0) found.push(`[${label}: ${p.name}] page error: ${errors.splice(0).join('; ')}`);
  }
}

describe('accessibility of every page', () => {
  it('signed out: sign-in and sign-up have no serious or critical violation', async () => {
    const page = await browser.newPage({ viewport: { width: 1280, height: 860 } });
    const found: string[] = [];
    for (const [name, path] of [['sign-in', '/sign-in'], ['sign-up', '/sign-up']]) {
      await page.goto(`${server.url}${path}`);
      await page.getByRole('button').first().waitFor();
      found.push(...(await seriousViolations(page)).map((v) => `[${name}] ${v}`));
    }
    await page.close();
    expect(found).toEqual([]);
  });

  it('as the owner: the new-project, save-revision and request-review dialogs have no serious or critical violation', async () => {
    const page = await browser.newPage({ viewport: { width: 1440, height: 900 } });
    const errors: string[] = [];
    page.on('pageerror', (e) => errors.push(String(e)));
    await signIn(page, server.url, 'owner@demo.test');
    await page.waitForURL(/\/projects/);
    const ids = await demoIds(page);
    const found: string[] = [];
    const check = async (name: string) => {
      await page.getByRole('dialog').waitFor();
      found.push(...(await seriousViolations(page)).map((v) => `[dialog: ${name}] ${v}`));
      await page.keyboard.press('Escape');
      await page.getByRole('dialog').waitFor({ state: 'detached' });
    };
    await page.getByRole('button', { name: 'New project' }).first().click();
    await check('new project');
    await page.goto(`${server.url}/diagrams/${ids.diagramId}`);
    await page.locator('.react-flow__node').first().waitFor();
    await page.getByRole('button', { name: 'Save revision…' }).click();
    await check('save revision');
    await page.getByRole('button', { name: 'Request review…' }).click();
    await page.getByRole('dialog').getByRole('checkbox').first().waitFor();
    await check('request review');
    await page.close();
    expect(errors).toEqual([]);
    expect(found).toEqual([]);
  });

  for (const role of ['owner', 'designer', 'reviewer'] as const) {
    it(`as the ${role}: every page, and the open notification list, has no serious or critical violation`, async () => {
      const page = await browser.newPage({ viewport: { width: 1440, height: 900 } });
      await signIn(page, server.url, `${role}@demo.test`);
      await page.waitForURL(/\/projects/);
      const found: string[] = [];
      await visitAll(page, role, found);

      await page.goto(`${server.url}/account`);
      await page.getByRole('button', { name: /^Notifications/ }).click();
      await page.getByRole('menu').waitFor();
      found.push(...(await seriousViolations(page)).map((v) => `[${role}: notifications] ${v}`));
      await page.screenshot({ path: screenshotPath(`a11y-${role}-notifications`) });
      await page.close();
      expect(found).toEqual([]);
    });
  }
});
