/**
 * Browser benchmark of the editor with 200 parts (node_modules/.bin/tsx bench/browser/editor-drag.ts).
 *
 * Starts a real server (tests/browser/support.ts: builds the client when stale, fresh PGlite data dir,
 * demo data), signs in as the demo designer, creates a 200-part diagram through the API, opens it in
 * Debian's chromium and measures:
 * - dragging one battery with page.mouse in many steps, at the fitted view (every part and cable on
 *   screen) and zoomed in: requestAnimationFrame timestamps recorded in the page → frame intervals
 *   (median, 95th percentile) and frames per second, plus long tasks; an idle baseline first;
 * - a property edit → updated figure on the canvas: from the input event's timestamp to the
 *   MutationObserver seeing the battery's figure text change (one battery's internal resistance, and the
 *   inverter's power, which changes every figure); the results hook's performance marks give the
 *   worker's own time and when the full analysis (findings) landed;
 * - the JavaScript the editor route loads (files, raw and gzipped from dist/client).
 *
 * Options: --moves N (default 150), --edits N (default 10), --json (machine-readable output only),
 * --profile (CPU profile of the fitted-view drag), --fit-only (no zoomed drag, no edits), --edit-only (edits only).
 * A benchmark, not a test: it asserts nothing and is not part of npm test.
 */
import { readFileSync, writeFileSync, mkdirSync } from 'node:fs';
import { cpus, loadavg } from 'node:os';
import { basename, join } from 'node:path';
import { gzipSync } from 'node:zlib';
import type { Page } from 'playwright-core';
import { launchBrowser, screenshotPath, signIn, startServer } from '../../tests/browser/support';
import { bank200 } from './bank200';

const args = process.argv.slice(2);
const opt = (name: string, dflt: number) => {
  const i = args.indexOf(name);
  return i >= 0 ? Number(args[i + 1]) : dflt;
};
const MOVES = opt('--moves', 150);
const EDITS = opt('--edits', 10);
const SKIP_ZOOMED = args.includes('--fit-only');
/** Only the property edits (no drags): for quick rounds on the edit path. */
const EDIT_ONLY = args.includes('--edit-only');
const JSON_ONLY = args.includes('--json');
/** Write a CPU profile of the fitted-view drag to test-results/bench-editor-drag.cpuprofile. */
const PROFILE = args.includes('--profile');
/** Trace the battery edits and list the page's main-thread time by trace event name. */
const TRACE = args.includes('--trace');
const log = (...xs: unknown[]) => {
  if (!JSON_ONLY) console.error(...xs);
};

const quantile = (xs: number[], q: number) => {
  if (!xs.length) return NaN;
  const s = [...xs].sort((a, b) => a - b);
  const pos = (s.length - 1) * q;
  const lo = Math.floor(pos);
  return s[lo] + (s[Math.min(lo + 1, s.length - 1)] - s[lo]) * (pos - lo);
};
const r1 = (x: number) => Math.round(x * 10) / 10;

interface FrameStats {
  frames: number;
  median_ms: number;
  p95_ms: number;
  max_ms: number;
  fps_median: number;
  fps_p5: number;
  longTasks: number;
  longTask_ms: number;
}

function frameStats(stamps: number[], longTasks: number[]): FrameStats {
  const d = stamps.slice(1).map((t, i) => t - stamps[i]);
  const median = quantile(d, 0.5);
  const p95 = quantile(d, 0.95);
  return {
    frames: d.length, median_ms: r1(median), p95_ms: r1(p95), max_ms: r1(Math.max(...d)),
    fps_median: r1(1000 / median), fps_p5: r1(1000 / p95), longTasks: longTasks.length, longTask_ms: r1(longTasks.reduce((a, b) => a + b, 0)),
  };
}

/** Start recording rAF timestamps and long tasks in the page. */
async function startFrames(page: Page) {
  await page.evaluate(() => {
    const w = window as unknown as { __bw: { stamps: number[]; long: number[]; on: boolean; obs?: PerformanceObserver } };
    w.__bw = { stamps: [], long: [], on: true };
    try {
      w.__bw.obs = new PerformanceObserver((list) => {
        for (const e of list.getEntries()) w.__bw.long.push(e.duration);
      });
      w.__bw.obs.observe({ type: 'longtask', buffered: false });
    } catch {
      /* no long-task timing */
    }
    const tick = (t: number) => {
      if (!w.__bw.on) return;
      w.__bw.stamps.push(t);
      requestAnimationFrame(tick);
    };
    requestAnimationFrame(tick);
  });
}

async function stopFrames(page: Page): Promise<FrameStats> {
  const { stamps, long } = await page.evaluate(() => {
    const w = window as unknown as { __bw: { stamps: number[]; long: number[]; on: boolean; obs?: PerformanceObserver } };
    w.__bw.on = false;
    w.__bw.obs?.disconnect();
    return { stamps: w.__bw.stamps, long: w.__bw.long };
  });
  return frameStats(stamps, long);
}

async function nodeCentre(page: Page, id: string) {
  const box = await page.locator(`.react-flow__node[data-id="${id}"]`).boundingBox();
  if (!box) throw new Error(`node ${id} not on screen`);
  return { x: box.x + box.width / 2, y: box.y + box.height / 2, w: box.width };
}

/** Drag a node in `moves` small steps along a loop, recording frames. */
type MainThread = Record<'script_ms' | 'layout_ms' | 'style_ms' | 'task_ms', number>;

/** Main-thread time by kind over `f`, from the DevTools protocol's Performance metrics. */
async function mainThread<T>(page: Page, f: () => Promise<T>): Promise<[T, MainThread]> {
  const cdp = await page.context().newCDPSession(page);
  await cdp.send('Performance.enable');
  const read = async () => Object.fromEntries(((await cdp.send('Performance.getMetrics')) as { metrics: { name: string; value: number }[] }).metrics.map((m) => [m.name, m.value]));
  const a = await read();
  const out = await f();
  const b = await read();
  await cdp.detach();
  const d = (k: string) => r1((b[k] - a[k]) * 1000);
  return [out, { script_ms: d('ScriptDuration'), layout_ms: d('LayoutDuration'), style_ms: d('RecalcStyleDuration'), task_ms: d('TaskDuration') }];
}

async function dragBench(page: Page, id: string, moves: number, radius: number): Promise<FrameStats & { moved: boolean; zoom: number; mainThread: MainThread; wall_ms: number }> {
  const zoom = await page.evaluate(() => {
    const t = getComputedStyle(document.querySelector('.react-flow__viewport')!).transform;
    return new DOMMatrixReadOnly(t).a;
  });
  const before = await page.locator(`.react-flow__node[data-id="${id}"]`).getAttribute('style');
  const c = await nodeCentre(page, id);
  // Grab the node's body, left of its label (the label passes pointer events through anyway).
  const x0 = c.x - c.w * 0.3;
  const y0 = c.y;
  await page.mouse.move(x0, y0);
  await page.mouse.down();
  const t0 = Date.now();
  const [stats, main] = await mainThread(page, async () => {
    await startFrames(page);
    for (let i = 1; i <= moves; i++) {
      // A loop back to near the start (a few grid steps off), so the part stays among its neighbours.
      const a = (i / moves) * Math.PI * 2;
      await page.mouse.move(x0 + Math.sin(a) * radius + (i / moves) * 12, y0 + (1 - Math.cos(a)) * radius * 0.5);
    }
    return stopFrames(page);
  });
  const wall_ms = Date.now() - t0;
  await page.mouse.up();
  const after = await page.locator(`.react-flow__node[data-id="${id}"]`).getAttribute('style');
  return { ...stats, moved: before !== after, zoom: Math.round(zoom * 100) / 100, mainThread: main, wall_ms };
}

/** Where an edit's time went, ms: input → store change → posted → worker took it → answered → back on the page → applied → DOM. */
interface EditSteps {
  inputToChange: number;
  changeToPost: number;
  postCall: number;
  toWorker: number;
  inWorker: number;
  fromWorker: number;
  apply: number;
  render: number;
}
interface TraceEvent { name: string; ph: string; ts: number; dur?: number; pid: number; tid: number; cat?: string; args?: { name?: string } }

const TIMELINE_EVENTS = new Set(['EventDispatch', 'FunctionCall', 'HandlePostMessage', 'TimerFire', 'FireAnimationFrame', 'RunMicrotasks', 'UpdateLayoutTree', 'Layout', 'PrePaint', 'Paint', 'Layerize', 'Commit', 'MajorGC', 'MinorGC']);

/** The main thread's events from each `bw-change` mark to the next `bw-dom` mark (the edit's figure in the DOM): "start+duration name", ms. */
function editTimelines(events: TraceEvent[], main: TraceEvent): string[][] {
  const marks = events.filter((e) => e.cat?.includes('blink.user_timing') && (e.name === 'bw-change' || e.name === 'bw-dom') && e.ph !== 'e').sort((a, b) => a.ts - b.ts);
  const out: string[][] = [];
  for (let i = 0; i < marks.length; i++) {
    if (marks[i].name !== 'bw-change') continue;
    const end = marks.slice(i + 1).find((m) => m.name === 'bw-dom');
    if (!end) continue;
    const t0 = marks[i].ts;
    out.push(
      events
        .filter((e) => e.pid === main.pid && e.tid === main.tid && e.ph === 'X' && TIMELINE_EVENTS.has(e.name) && e.ts + (e.dur ?? 0) >= t0 && e.ts <= end.ts && (e.dur ?? 0) >= 300)
        .sort((a, b) => a.ts - b.ts)
        .map((e) => `${r1((e.ts - t0) / 1000)}+${r1((e.dur ?? 0) / 1000)} ${e.name}`)
        .concat([`${r1((end.ts - t0) / 1000)} DOM`]),
    );
  }
  return out;
}

/** Start a DevTools trace; the returned function stops it and sums the renderer main thread's complete events by name, ms. */
async function startTrace(page: Page) {
  const cdp = await page.context().newCDPSession(page);
  const events: TraceEvent[] = [];
  cdp.on('Tracing.dataCollected', (e) => {
    events.push(...(e.value as unknown as TraceEvent[]));
  });
  await cdp.send('Tracing.start', { categories: 'devtools.timeline,disabled-by-default-devtools.timeline,blink.user_timing', transferMode: 'ReportEvents' });
  return async () => {
    const done = new Promise<void>((resolve) => cdp.once('Tracing.tracingComplete', () => resolve()));
    await cdp.send('Tracing.end');
    await done;
    await cdp.detach();
    const main = events.find((e) => e.ph === 'M' && e.name === 'thread_name' && e.args?.name === 'CrRendererMain');
    const byName = new Map<string, number>();
    for (const e of events) {
      if (!main || e.pid !== main.pid || e.tid !== main.tid || e.ph !== 'X' || !e.dur) continue;
      byName.set(e.name, (byName.get(e.name) ?? 0) + e.dur / 1000);
    }
    const totals = Object.fromEntries([...byName].sort((a, b) => b[1] - a[1]).slice(0, 20).map(([k, v]) => [k, r1(v)]));
    return { totals, editTimelines: main ? editTimelines(events, main).slice(0, 3) : [] };
  };
}

interface EditSample {
  toDom_ms: number;
  figuresMark_ms: number | null;
  worker_ms: number | null;
  full_ms: number | null;
  steps: EditSteps | null;
  /** Long animation frames (over 50 ms) between the input and the figure in the DOM. */
  longFrames?: unknown[];
}

/** Type values into a field one edit at a time; time input event → the watched figure's text changes. */
async function editBench(page: Page, fieldLabel: string, values: string[], watch: string): Promise<EditSample[]> {
  const field = page.getByLabel(fieldLabel, { exact: true });
  await field.waitFor();
  const out: EditSample[] = [];
  for (const v of values) {
    // Arm the watchers first (and wait for that), then type: otherwise the input could come first.
    await field.evaluate(
      (input, sel) => {
        const w = window as unknown as { __bwEdit: Promise<EditSample> };
        w.__bwEdit = new Promise<EditSample>((resolve, reject) => {
          const target = document.querySelector(sel);
          if (!target) return reject(new Error(`no ${sel}`));
          const before = target.textContent;
          let t0 = 0;
          const marksBefore = performance.getEntriesByType('mark').length;
          input.addEventListener('input', (e) => (t0 = e.timeStamp), { capture: true, once: true });
          // Long animation frames (over 50 ms) in the edit: where the main thread's time went.
          type Loaf = PerformanceEntry & { renderStart: number; styleAndLayoutStart: number; blockingDuration: number; scripts: (PerformanceEntry & { invoker: string; forcedStyleAndLayoutDuration: number })[] };
          const loafs: Loaf[] = [];
          const loafObs = new PerformanceObserver((l) => loafs.push(...(l.getEntries() as Loaf[])));
          try {
            loafObs.observe({ type: 'long-animation-frame', buffered: false });
          } catch {
            /* not supported */
          }
          const obs = new MutationObserver(() => {
            if (!t0 || target.textContent === before) return;
            const t1 = performance.now();
            performance.mark('bw-dom');
            obs.disconnect();
            const r = (x: number) => Math.round(x * 10) / 10;
            const frames = () =>
              loafs
                .filter((f) => f.startTime + f.duration >= t0 && f.startTime <= t1)
                .map((f) => ({
                  at: r(f.startTime - t0), ms: r(f.duration), render: r(f.startTime + f.duration - f.renderStart), styleLayout: r(f.startTime + f.duration - f.styleAndLayoutStart),
                  scripts: f.scripts.map((x) => `${x.invoker} ${r(x.duration)}${x.forcedStyleAndLayoutDuration ? ` (forced layout ${r(x.forcedStyleAndLayoutDuration)})` : ''}`),
                }));
            // Let the full analysis land too, then read the marks of this edit.
            setTimeout(() => {
              const marks = performance.getEntriesByType('mark').slice(marksBefore) as PerformanceMark[];
              const change = marks.find((m) => m.name === 'bw-change');
              const figures = marks.find((m) => m.name === 'bw-figures');
              const full = marks.filter((m) => m.name === 'bw-full').pop();
              const d = figures?.detail as Record<string, number> | undefined;
              const steps =
                d && change && d.posted !== undefined
                  ? {
                      inputToChange: change.startTime - t0, changeToPost: d.posted - change.startTime, postCall: d.postReturned - d.posted,
                      toWorker: d.received - d.postReturned, inWorker: d.answered - d.received, fromWorker: d.arrived - d.answered,
                      apply: d.applied - d.arrived, render: t1 - d.applied,
                    }
                  : null;
              loafObs.disconnect();
              resolve({
                longFrames: frames(),
                steps,
                toDom_ms: t1 - t0,
                figuresMark_ms: figures && change ? figures.startTime - change.startTime : null,
                worker_ms: figures ? (figures.detail as { worker_ms: number }).worker_ms : null,
                full_ms: full && change ? full.startTime - change.startTime : null,
              });
            }, 1500);
          });
          obs.observe(target, { subtree: true, childList: true, characterData: true });
          setTimeout(() => reject(new Error('no update within 10 s')), 10_000);
        });
      },
      watch,
    );
    await field.fill(v);
    out.push(await page.evaluate(() => (window as unknown as { __bwEdit: Promise<EditSample> }).__bwEdit));
  }
  return out;
}

function summarise(samples: EditSample[]) {
  const pick = (f: (s: EditSample) => number | null) => samples.map(f).filter((x): x is number => x !== null);
  const q = (xs: number[]) => (xs.length ? { median: r1(quantile(xs, 0.5)), p90: r1(quantile(xs, 0.9)), max: r1(Math.max(...xs)) } : null);
  const withSteps = samples.filter((s) => s.steps);
  const steps = withSteps.length
    ? Object.fromEntries((Object.keys(withSteps[0].steps!) as (keyof EditSteps)[]).map((k) => [k, r1(quantile(withSteps.map((s) => s.steps![k]), 0.5))]))
    : null;
  return {
    n: samples.length, toDom_ms: q(pick((s) => s.toDom_ms)), figuresMark_ms: q(pick((s) => s.figuresMark_ms)), worker_ms: q(pick((s) => s.worker_ms)), full_ms: q(pick((s) => s.full_ms)),
    /** Median of each step (medians do not add up to the total's median). */
    steps_median_ms: steps,
  };
}

/** The scripts the editor route loaded on open (not the workers), with sizes from dist/client. */
async function routeScripts(page: Page) {
  const entries = await page.evaluate(() =>
    (performance.getEntriesByType('resource') as PerformanceResourceTiming[])
      .filter((e) => /\.js(\?|$)/.test(e.name))
      .map((e) => ({ name: new URL(e.name).pathname, initiator: e.initiatorType })),
  );
  const rows = entries.map((e) => {
    let raw = 0;
    let gz = 0;
    try {
      const buf = readFileSync(join(process.cwd(), 'dist/client', e.name));
      raw = buf.length;
      gz = gzipSync(buf, { level: 9 }).length;
    } catch {
      /* not a built file */
    }
    return { file: basename(e.name), initiator: e.initiator, kB: r1(raw / 1024), gzip_kB: r1(gz / 1024) };
  });
  const worker = (r: { file: string }) => /worker/i.test(r.file);
  const initial = rows.filter((r) => !worker(r));
  return { initial, workers: rows.filter(worker), initialGzip_kB: r1(initial.reduce((a, r) => a + r.gzip_kB, 0)), initial_kB: r1(initial.reduce((a, r) => a + r.kB, 0)) };
}

async function main() {
  const load0 = loadavg();
  log(`starting the server (builds the client when stale)…`);
  const server = await startServer();
  const browser = await launchBrowser();
  try {
    const page = await browser.newPage({ viewport: { width: 1440, height: 900 } });
    page.setDefaultTimeout(60_000);
    // tsx keeps function names with an `__name` helper that the page does not have.
    await page.addInitScript('window.__name = (f) => f');
    await signIn(page, server.url, 'designer@demo.test');
    await page.waitForURL(/\/projects/);
    const doc = bank200();
    const id = await page.evaluate(async (content) => {
      const me = await (await fetch('/api/auth/me')).json();
      const { projects } = await (await fetch(`/api/projects?teamId=${me.teams[0].id}`)).json();
      const res = await fetch(`/api/projects/${projects[0].id}/diagrams`, {
        method: 'POST', headers: { 'Content-Type': 'application/json' }, body: JSON.stringify({ name: 'Benchmark bank, 200 parts', content }),
      });
      if (res.status !== 201) throw new Error(`create diagram answered ${res.status}: ${await res.text()}`);
      return (await res.json()).diagram.id as string;
    }, doc);
    log(`diagram ${id}: ${doc.parts.length} parts, ${doc.cables.length} cables; opening the editor…`);
    const tOpen = Date.now();
    await page.goto(`${server.url}/diagrams/${id}`);
    await page.getByRole('heading', { name: 'Benchmark bank, 200 parts' }).waitFor();
    await page.getByRole('button', { name: 'Dismiss the safety note' }).click();
    await page.waitForFunction((n) => document.querySelectorAll('.react-flow__node').length === n, doc.parts.length);
    await page.getByTestId('share-bat1').waitFor();
    const open_ms = Date.now() - tOpen;
    const scripts = await routeScripts(page);
    await page.waitForTimeout(1500);

    await startFrames(page);
    await page.waitForTimeout(1000);
    const idle = await stopFrames(page);
    log('idle', idle);

    let dragFit: Awaited<ReturnType<typeof dragBench>> | null = null;
    let dragZoomed: Awaited<ReturnType<typeof dragBench>> | null = null;
    if (!EDIT_ONLY) {
      const cdp = PROFILE ? await page.context().newCDPSession(page) : null;
      if (cdp) {
        await cdp.send('Profiler.enable');
        await cdp.send('Profiler.setSamplingInterval', { interval: 200 });
        await cdp.send('Profiler.start');
    }
    const stopDragTrace = TRACE ? await startTrace(page) : null;
    dragFit = await dragBench(page, 'bat30', MOVES, 40);
    if (stopDragTrace) log('main thread over the fitted-view drag (trace)', await stopDragTrace());
    if (cdp) {
      const { profile } = (await cdp.send('Profiler.stop')) as { profile: unknown };
      mkdirSync('test-results', { recursive: true });
      writeFileSync('test-results/bench-editor-drag.cpuprofile', JSON.stringify(profile));
      await cdp.detach();
    }
    log('drag at the fitted view', dragFit);
    await page.screenshot({ path: screenshotPath('bench-editor-200-fit') });

    // Zoom in on the middle of the bank (about 1:1) and drag again: fewer parts on screen, larger ones.
    if (SKIP_ZOOMED) throw Object.assign(new Error('--fit-only'), { partial: { idle, dragFit } });
    const c = await nodeCentre(page, 'bat32');
    await page.mouse.move(c.x, c.y);
    for (let i = 0; i < 8; i++) {
      await page.mouse.wheel(0, -200);
      await page.waitForTimeout(60);
    }
    await page.waitForTimeout(500);
    dragZoomed = await dragBench(page, 'bat32', MOVES, 120);
    log('drag zoomed in', dragZoomed);
    await page.screenshot({ path: screenshotPath('bench-editor-200-zoomed') });
    }

    // Property edits: one battery's internal resistance (its own figure changes), then the inverter's power (every figure changes).
    await page.locator('.react-flow__node[data-id="bat32"]').focus();
    await page.keyboard.press('Enter');
    const vals = (a: string, b: string) => Array.from({ length: EDITS }, (_, i) => (i % 2 ? a : b));
    // With --profile --edit-only: a CPU profile of the battery edits instead of the drag; with --trace, the
    // main thread's time by trace event (script, style, layout, paint …) over the battery edits.
    const editCdp = PROFILE && EDIT_ONLY ? await page.context().newCDPSession(page) : null;
    if (editCdp) {
      await editCdp.send('Profiler.enable');
      await editCdp.send('Profiler.setSamplingInterval', { interval: 200 });
      await editCdp.send('Profiler.start');
    }
    const stopTrace = TRACE ? await startTrace(page) : null;
    const battery = await editBench(page, 'Internal resistance', vals('2', '30'), '[data-testid="share-bat32"]');
    if (stopTrace) log('main thread over the battery edits (trace)', JSON.stringify(await stopTrace(), null, 1));
    if (editCdp) {
      const { profile } = (await editCdp.send('Profiler.stop')) as { profile: unknown };
      mkdirSync('test-results', { recursive: true });
      writeFileSync('test-results/bench-editor-edit.cpuprofile', JSON.stringify(profile));
      await editCdp.detach();
    }
    log('battery edit', summarise(battery));
    await page.getByRole('button', { name: 'Fit', exact: true }).click();
    await page.waitForTimeout(600);
    await page.locator('.react-flow__node[data-id="inverter"]').focus();
    await page.keyboard.press('Enter');
    const inverter = await editBench(page, 'AC output power', vals('2000', '2600'), '[data-testid="share-bat1"]');
    log('inverter edit', summarise(inverter));

    const result = {
      machine: { cores: cpus().length, cpu: cpus()[0]?.model ?? 'unknown', node: process.version, loadavgStart: load0.map(r1), loadavgEnd: loadavg().map(r1) },
      diagram: { parts: doc.parts.length, cables: doc.cables.length },
      open_ms,
      scripts,
      idle,
      dragFit,
      dragZoomed,
      editBattery: summarise(battery),
      editInverter: summarise(inverter),
      raw: { battery, inverter },
    };
    mkdirSync('test-results', { recursive: true });
    writeFileSync('test-results/bench-editor-drag.json', JSON.stringify(result, null, 2));
    if (JSON_ONLY) process.stdout.write(JSON.stringify(result, null, 2) + '\n');
    else {
      const { raw: _raw, ...brief } = result;
      void _raw;
      console.log(JSON.stringify(brief, null, 2));
    }
  } catch (e) {
    const partial = (e as { partial?: unknown }).partial;
    if (!partial) throw e;
    console.log(JSON.stringify(partial, null, 2));
  } finally {
    await browser.close();
    await server.stop();
  }
}

main().catch((e) => {
  console.error(e);
  process.exit(1);
});
