/**
 * Structured logs (pino, JSON lines) and one line per request (pino-http), docs/decisions/014.
 *
 * What a line may hold — OWASP Logging Cheat Sheet ("data to exclude"), OWASP ASVS 5.0 16.2 / 16.3:
 * a request id (also answered in `X-Request-Id` and in error bodies, so a user's report finds its line),
 * the method, the route *pattern* (`/api/diagrams/:id`, never the path as sent), the status and the
 * duration, the signed-in user's id and the route's ids. Never query strings, headers, cookies, bodies
 * or stored documents. A server fault logs its class, its codes (e.g. PostgreSQL's SQLSTATE) and its
 * code path (stack frames) — never its message, which for a database error quotes the query's
 * parameters, i.e. the whole document being saved.
 */
import { randomUUID } from 'node:crypto';
import type { IncomingMessage, ServerResponse } from 'node:http';
import type { Request, RequestHandler, Response } from 'express';
import { pino, type DestinationStream, type Level, type Logger } from 'pino';
import { pinoHttp } from 'pino-http';

export type { Logger };
export type LogLevel = Level | 'silent';
export const LOG_LEVELS = ['fatal', 'error', 'warn', 'info', 'debug', 'trace', 'silent'] as const;

/** A pino logger at `level`, writing JSON lines to `destination` (stdout by default). */
export function createLogger(level: LogLevel, destination?: DestinationStream): Logger {
  return pino({ level, base: { app: 'bankwright' }, timestamp: pino.stdTimeFunctions.isoTime }, destination);
}

let processLogger: Logger = createLogger('silent');

/** The process's logger, for code that runs outside a request (storage clean-up, workers). */
export function log(): Logger {
  return processLogger;
}

/** server/index.ts sets the process's logger once the configuration is read. */
export function setProcessLogger(logger: Logger): void {
  processLogger = logger;
}

const MAX_FRAMES = 12;

/** Stack frames only: the first lines of a stack repeat the message, which may quote data. */
function frames(stack: unknown): string[] | undefined {
  if (typeof stack !== 'string') return undefined;
  const out = stack
    .split('\n')
    .filter((l) => /^\s+at /.test(l))
    .slice(0, MAX_FRAMES)
    .map((l) => l.trim().slice(0, 300));
  return out.length ? out : undefined;
}

const SAFE_STRING = /^[A-Za-z0-9_.:-]{1,80}$/;
const pick = (v: unknown) => (typeof v === 'string' && SAFE_STRING.test(v) ? v : typeof v === 'number' ? v : undefined);

/**
 * What a log line says about an error: its class, codes and schema names (SQLSTATE, errno code, the
 * PostgreSQL routine, table, column or constraint), its frames, and the same for its cause. Never
 * `message`, `detail`, `where`, `query`, `params` or any other property: they carry data.
 */
export function errorSummary(err: unknown, depth = 0): Record<string, unknown> | undefined {
  if (err === null || err === undefined) return undefined;
  if (typeof err !== 'object') return { type: typeof err };
  const e = err as Record<string, unknown>;
  const summary: Record<string, unknown> = { type: (err as object).constructor?.name ?? 'Object' };
  for (const key of ['code', 'errno', 'routine', 'table', 'column', 'constraint', 'status', 'statusCode', 'type'] as const) {
    const v = pick(e[key]);
    if (v !== undefined) summary[key === 'type' ? 'kind' : key] = v;
  }
  summary.frames = frames(e.stack);
  if (depth < 3 && e.cause !== undefined) summary.cause = errorSummary(e.cause, depth + 1);
  return summary;
}

export const REQUEST_ID_HEADER = 'X-Request-Id';

type RouteInfo = { pattern?: string; params?: Record<string, string> };
const ROUTE = Symbol('bankwright.route');

/** The route pattern and its ids, as recorded when the router matched the request. */
export function routeOf(res: ServerResponse): RouteInfo {
  return ((res as unknown as Record<symbol, RouteInfo>)[ROUTE] ??= {});
}

/**
 * Records the matched route's pattern (mount path + route path) and its parameters as the router sets
 * them; by the time an error reaches the error handler, Express has already restored both to the
 * outer router's values.
 */
function recordRoute(req: Request, res: Response): void {
  const info = routeOf(res);
  let route: unknown = req.route;
  let params: unknown = req.params;
  Object.defineProperty(req, 'route', {
    configurable: true,
    enumerable: true,
    get: () => route,
    set(v: { path?: unknown } | undefined) {
      route = v;
      if (v && typeof v.path === 'string') info.pattern = `${req.baseUrl}${v.path}`;
    },
  });
  Object.defineProperty(req, 'params', {
    configurable: true,
    enumerable: true,
    get: () => params,
    set(v: unknown) {
      params = v;
      if (v && typeof v === 'object' && Object.keys(v).length > 0) {
        // Route parameters are ids; cut anything longer than an id could be.
        info.params = Object.fromEntries(Object.entries(v as Record<string, unknown>).map(([k, x]) => [k, String(x).slice(0, 64)]));
      }
    },
  });
}

/** The user id of the session, if any (server/http/context.ts keeps the session in res.locals.auth). */
function userIdOf(res: ServerResponse): string | undefined {
  const locals = (res as Response).locals as { auth?: { user?: { id?: string } } } | undefined;
  return locals?.auth?.user?.id;
}

/**
 * One log line per request: id, method, route pattern, status, duration (ms), user id; 5xx with the error
 * summary. `route` is null for a request refused before any route matched (the input rules, an unknown path).
 */
export function requestLogging(logger: Logger): RequestHandler {
  const http = pinoHttp({
    logger,
    quietReqLogger: true,
    wrapSerializers: false,
    genReqId: (_req: IncomingMessage, res: ServerResponse) => {
      const id = randomUUID();
      res.setHeader(REQUEST_ID_HEADER, id);
      return id;
    },
    customAttributeKeys: { responseTime: 'durationMs' },
    serializers: {
      req: (req: IncomingMessage) => ({ method: req.method }),
      res: (res: ServerResponse) => ({ status: res.statusCode }),
      err: (err: unknown) => errorSummary(err),
    },
    customProps: (_req: IncomingMessage, res: ServerResponse) => {
      const info = routeOf(res);
      if (!res.headersSent && !info.pattern) return {};
      const userId = userIdOf(res);
      return { route: info.pattern ?? null, ...(info.params ? { ids: info.params } : {}), ...(userId ? { userId } : {}) };
    },
    customLogLevel: (_req: IncomingMessage, res: ServerResponse, err?: Error) => (err || res.statusCode >= 500 ? 'error' : 'info'),
    customSuccessMessage: (req: IncomingMessage, res: ServerResponse) => `${req.method} ${routeOf(res).pattern ?? '(not routed)'} ${res.statusCode}`,
    customErrorMessage: (req: IncomingMessage, res: ServerResponse) => `${req.method} ${routeOf(res).pattern ?? '(not routed)'} ${res.statusCode} failed`,
  });
  return (req, res, next) => {
    recordRoute(req, res);
    http(req, res, next);
  };
}
