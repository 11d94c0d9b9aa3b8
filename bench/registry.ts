/**
 * Benchmark registry. Every `bench/*.bench.ts` file exports `cases: BenchCase[]`; `npm run bench`
 * (bench/index.ts) finds the files, runs every case and prints one table.
 */
export interface BenchCase<T = unknown> {
  /** Shown in the table; also what `--only` matches. */
  name: string;
  /** Untimed preparation; its value is passed to `run`. */
  setup?: () => T | Promise<T>;
  /** The timed work (wall time of one call). */
  run?: (input: T) => unknown;
  /**
   * Instead of `run`: a case that reports its own time per sample in ms (e.g. an external program's
   * own analysis time). Return null when the case cannot run here (shown as skipped).
   */
  measure?: (input: T) => Promise<number | null>;
  /**
   * Timed samples (default 21) after the warm-up; stops early after `maxSeconds` (default 20). The
   * warm-up calls `run` until `warmupSeconds` (default 0.5) have passed or 50 calls are done (at least
   * one), so the samples time the optimized code, not the JIT tiering; a `measure` case warms up once.
   */
  samples?: number;
  warmupSeconds?: number;
  maxSeconds?: number;
  /** Target median in ms and peak memory in MB, printed beside the result. */
  targetMs?: number;
  targetMb?: number;
  /** Run in a fresh child process and report its peak RSS and heap. */
  memory?: boolean;
  /** Short remark shown under the table. */
  note?: string;
}

export interface BenchResult {
  name: string;
  samples: number;
  medianMs: number | null;
  minMs: number | null;
  maxMs: number | null;
  targetMs?: number;
  targetMb?: number;
  peakRssMb?: number;
  baselineRssMb?: number;
  peakHeapMb?: number;
  skipped?: string;
  note?: string;
}

const median = (xs: number[]) => {
  const s = [...xs].sort((a, b) => a - b);
  return s.length % 2 ? s[(s.length - 1) / 2] : (s[s.length / 2 - 1] + s[s.length / 2]) / 2;
};

/** Runs one case in this process. */
export async function runCase(c: BenchCase): Promise<BenchResult> {
  const base = { name: c.name, targetMs: c.targetMs, targetMb: c.targetMb, note: c.note };
  const baselineRss = process.memoryUsage().rss;
  const input = c.setup ? await c.setup() : undefined;
  const wanted = c.samples ?? 21;
  const deadline = performance.now() + (c.maxSeconds ?? 20) * 1000;
  const times: number[] = [];
  let peakHeap = 0;
  const one = async (): Promise<number | null> => {
    if (c.measure) return c.measure(input);
    const t0 = performance.now();
    c.run!(input);
    const dt = performance.now() - t0;
    peakHeap = Math.max(peakHeap, process.memoryUsage().heapUsed);
    return dt;
  };
  const warm = await one();
  if (warm === null) return { ...base, samples: 0, medianMs: null, minMs: null, maxMs: null, skipped: 'not available here' };
  if (!c.measure) {
    const warmUntil = performance.now() + (c.warmupSeconds ?? 0.5) * 1000;
    for (let i = 1; i < 50 && performance.now() < warmUntil; i++) await one();
  }
  while (times.length < wanted && (times.length < 3 || performance.now() < deadline)) {
    const t = await one();
    if (t === null) break;
    times.push(t);
  }
  return {
    ...base,
    samples: times.length,
    medianMs: median(times),
    minMs: Math.min(...times),
    maxMs: Math.max(...times),
    ...(c.memory
      ? {
          peakRssMb: process.resourceUsage().maxRSS / 1024,
          baselineRssMb: baselineRss / 2 ** 20,
          peakHeapMb: peakHeap / 2 ** 20,
        }
      : {}),
  };
}
