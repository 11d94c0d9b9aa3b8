/**
 * The user model of the load test (docs/decisions/011-save-path-and-load-models.md): N people, each in
 * their own signed-in session with their own diagram, working through the app with a pause between
 * actions, for a fixed time. Unlike the saturation phases (autocannon: every connection sends its next
 * request the moment the last one is answered), a person reads the screen before the next click, so
 * the server sees the request rate of N people rather than the most it can take.
 *
 * One person's session, repeated until the time is up:
 *   project list    GET /api/projects?teamId=…
 *   the project     GET /api/projects/:id/diagrams
 *   a diagram       GET /api/diagrams/:id
 *   its history     GET /api/diagrams/:id/revisions
 *   then 2–5 actions on the diagram, each chosen at random:
 *     35 %  check     POST /api/diagrams/:id/check with the edited document (the "check" button)
 *     20 %  save      POST /api/diagrams/:id/revisions on top of their latest revision
 *     25 %  revision  GET /api/diagrams/:id/revisions/:n (a random earlier revision)
 *     20 %  history   GET /api/diagrams/:id/revisions again
 * Think time: uniform 0.5–2 s after every answer (mean 1.25 s): a person clicking through screens they
 * know, on the fast side (reading a diagram or an analysis takes longer), so the model errs towards
 * more load, not less. People start at random moments in the first 2 s so they do not click in step.
 * Requests still in flight when the time is up are waited for and counted.
 *
 * Every request's latency is taken around fetch (Node's built-in undici, keep-alive connections) up to
 * the end of the body, and recorded per kind and overall.
 */
import { percentile } from '../faults/server-process';

export const THINK_MS = { min: 500, max: 2000 } as const;
export const ACTION_MIX = [
  { kind: 'check', weight: 0.35 },
  { kind: 'save', weight: 0.2 },
  { kind: 'revision', weight: 0.25 },
  { kind: 'history', weight: 0.2 },
] as const;
export const ACTIONS_PER_DIAGRAM = { min: 2, max: 5 } as const;

export type RequestKind = 'projects' | 'diagrams' | 'diagram' | 'revisions' | 'revision' | 'save' | 'check';

export interface Person {
  cookie: string;
  diagramId: string;
  /** Latest revision number of the person's diagram (their saves go on top of it). */
  base: number | null;
}

export interface UserModelOptions {
  base: string;
  origin: string;
  teamId: string;
  projectId: string;
  people: Person[];
  seconds: number;
  /** The document a person saves and checks (its name changes with every save). */
  doc: { name?: string } & Record<string, unknown>;
  /** Pseudo-random numbers in [0, 1): seeded, so two runs choose the same actions. */
  random: () => number;
  timeoutMs?: number;
}

interface Sample {
  kind: RequestKind;
  ms: number;
  status: number;
}

function latencyStats(ms: number[]) {
  const s = [...ms].sort((a, b) => a - b);
  const r = (x: number) => Math.round(x * 10) / 10;
  return { requests: s.length, p50: r(percentile(s, 50)), p90: r(percentile(s, 90)), p99: r(percentile(s, 99)), max: r(s[s.length - 1] ?? NaN) };
}

export async function runUserModel(o: UserModelOptions) {
  const samples: Sample[] = [];
  const errors: { kind: RequestKind; message: string }[] = [];
  const timeoutMs = o.timeoutMs ?? 10_000;
  const started = performance.now();
  const deadline = started + o.seconds * 1000;
  const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));
  const think = () => sleep(THINK_MS.min + o.random() * (THINK_MS.max - THINK_MS.min));
  const timeUp = () => performance.now() >= deadline;

  async function request(p: Person, kind: RequestKind, method: 'GET' | 'POST', url: string, body?: unknown): Promise<{ status: number; json: any } | null> {
    const t0 = performance.now();
    try {
      const res = await fetch(`${o.base}${url}`, {
        method,
        headers: { cookie: p.cookie, ...(method === 'POST' ? { origin: o.origin, 'content-type': 'application/json' } : {}) },
        body: body === undefined ? undefined : JSON.stringify(body),
        signal: AbortSignal.timeout(timeoutMs),
      });
      const text = await res.text();
      samples.push({ kind, ms: performance.now() - t0, status: res.status });
      try {
        return { status: res.status, json: JSON.parse(text) };
      } catch {
        return { status: res.status, json: null };
      }
    } catch (err) {
      errors.push({ kind, message: (err as Error).name === 'TimeoutError' ? 'timeout' : (err as Error).message });
      return null;
    }
  }

  function pick(): (typeof ACTION_MIX)[number]['kind'] {
    let r = o.random();
    for (const a of ACTION_MIX) {
      if ((r -= a.weight) < 0) return a.kind;
    }
    return ACTION_MIX[ACTION_MIX.length - 1].kind;
  }

  let saveCount = 0;
  async function person(p: Person) {
    await sleep(o.random() * 2000);
    while (!timeUp()) {
      const steps: [RequestKind, string][] = [
        ['projects', `/api/projects?teamId=${o.teamId}`],
        ['diagrams', `/api/projects/${o.projectId}/diagrams`],
        ['diagram', `/api/diagrams/${p.diagramId}`],
        ['revisions', `/api/diagrams/${p.diagramId}/revisions`],
      ];
      for (const [kind, url] of steps) {
        if (timeUp()) return;
        const r = await request(p, kind, 'GET', url);
        // As the editor does: a save goes on top of the latest revision the screen showed.
        if (kind === 'diagram' && r?.status === 200) p.base = r.json.diagram.latestRevision?.number ?? null;
        await think();
      }
      const actions = ACTIONS_PER_DIAGRAM.min + Math.floor(o.random() * (ACTIONS_PER_DIAGRAM.max - ACTIONS_PER_DIAGRAM.min + 1));
      for (let i = 0; i < actions && !timeUp(); i++) {
        const action = pick();
        if (action === 'check') {
          await request(p, 'check', 'POST', `/api/diagrams/${p.diagramId}/check`, { content: o.doc });
        } else if (action === 'save') {
          const content = { ...o.doc, name: `${o.doc.name ?? 'Diagram'} ${++saveCount}` };
          const r = await request(p, 'save', 'POST', `/api/diagrams/${p.diagramId}/revisions`, { baseRevision: p.base, message: 'user-model save', content });
          if (r?.status === 201) p.base = r.json.revision.number;
          else if (r?.status === 409) p.base = r.json?.error?.details?.latest?.number ?? null;
        } else if (action === 'revision' && p.base !== null) {
          await request(p, 'revision', 'GET', `/api/diagrams/${p.diagramId}/revisions/${1 + Math.floor(o.random() * p.base)}`);
        } else {
          await request(p, 'revisions', 'GET', `/api/diagrams/${p.diagramId}/revisions`);
        }
        await think();
      }
    }
  }

  await Promise.all(o.people.map(person));
  const seconds = (performance.now() - started) / 1000;
  const kinds = [...new Set(samples.map((s) => s.kind))].sort();
  const all = samples.map((s) => s.ms);
  const non2xx = samples.filter((s) => s.status < 200 || s.status >= 300);
  return {
    phase: 'users',
    people: o.people.length,
    seconds: Math.round(seconds * 10) / 10,
    thinkMs: THINK_MS,
    requestsPerSecond: Math.round((samples.length / seconds) * 10) / 10,
    latencyMs: latencyStats(all),
    non2xx: non2xx.length,
    non2xxStatuses: Object.fromEntries([...new Set(non2xx.map((s) => s.status))].map((st) => [st, non2xx.filter((s) => s.status === st).length])),
    errors: errors.length,
    errorMessages: [...new Set(errors.map((e) => `${e.kind}: ${e.message}`))].slice(0, 10),
    byKind: Object.fromEntries(
      kinds.map((k) => {
        const of = samples.filter((s) => s.kind === k);
        return [k, { ...latencyStats(of.map((s) => s.ms)), non2xx: of.filter((s) => s.status < 200 || s.status >= 300).length }];
      }),
    ),
  };
}
