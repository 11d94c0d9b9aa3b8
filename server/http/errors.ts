/** The API's one error shape: {"error":{"code","message","details"}}. */
import type { ErrorRequestHandler, RequestHandler } from 'express';
import type { z } from 'zod';
import type { ApiErrorBody } from '../../shared/schemas/errors';
import { DomainError, type DomainErrorKind, fieldErrors } from '../services/errors';

export { fieldErrors };

export class ApiError extends Error {
  constructor(
    readonly status: number,
    readonly code: string,
    message: string,
    readonly details?: unknown,
    readonly headers?: Record<string, string>,
  ) {
    super(message);
  }
}

export const notFound = (what = 'Not found.') => new ApiError(404, 'not_found', what);
export const forbidden = (message = 'Your role in this team does not allow this.') => new ApiError(403, 'forbidden', message);
export const unauthenticated = () => new ApiError(401, 'unauthenticated', 'Sign in to continue.');
export const conflict = (code: string, message: string, details?: unknown) => new ApiError(409, code, message, details);

/** The one place a service's domain error becomes an HTTP status (server/services/errors.ts). */
export const DOMAIN_STATUS: Record<DomainErrorKind, number> = {
  not_found: 404,
  forbidden: 403,
  unauthenticated: 401,
  conflict: 409,
  invalid: 400,
  unprocessable: 422,
  too_large: 413,
  unsupported: 415,
  rate_limited: 429,
  upstream_failed: 502,
  unavailable: 503,
  timeout: 504,
  failed: 500,
};

export function validationFailed(error: z.ZodError): ApiError {
  return new ApiError(400, 'validation_failed', 'Some fields need attention.', { fields: fieldErrors(error) });
}

/** The request's id travels in the X-Request-Id header (server/http/logger.ts); the body keeps its one shape. */
function send(res: Parameters<RequestHandler>[1], status: number, body: ApiErrorBody) {
  res.status(status).json(body);
}

export const apiNotFound: RequestHandler = (_req, res) => {
  send(res, 404, { error: { code: 'not_found', message: 'No such API route.' } });
};

/** Last handler: maps everything thrown to the error shape. Never sends a stack trace. */
export const errorHandler: ErrorRequestHandler = (err, _req, res, _next) => {
  if (res.headersSent) {
    res.end();
    return;
  }
  if (err instanceof DomainError) {
    const status = DOMAIN_STATUS[err.kind];
    if (err.retryAfter_s !== undefined) res.set('Retry-After', String(err.retryAfter_s));
    if (status >= 500) (res as { err?: unknown }).err = err;
    send(res, status, { error: { code: err.code, message: err.message, details: err.details } });
    return;
  }
  if (err instanceof ApiError) {
    if (err.headers) res.set(err.headers);
    // A server-side failure (502, 503, 504 …) is logged with its summary by the request log line.
    if (err.status >= 500) (res as { err?: unknown }).err = err;
    send(res, err.status, { error: { code: err.code, message: err.message, details: err.details } });
    return;
  }
  // body-parser errors
  const type = (err as { type?: string })?.type;
  if (type === 'entity.parse.failed') {
    send(res, 400, { error: { code: 'malformed_json', message: 'The request body is not valid JSON.' } });
    return;
  }
  if (type === 'entity.too.large') {
    send(res, 413, { error: { code: 'payload_too_large', message: 'The request body is too large.', details: { limitBytes: (err as { limit?: number }).limit } } });
    return;
  }
  const status = (err as { status?: number; statusCode?: number })?.status ?? (err as { statusCode?: number })?.statusCode;
  if (typeof status === 'number' && status >= 400 && status < 500) {
    // Other client errors raised by middleware (unsupported charset or encoding, aborted request, …).
    const code = status === 404 ? 'not_found' : status === 415 ? 'unsupported_media_type' : 'bad_request';
    send(res, status, { error: { code, message: status === 404 ? 'Not found.' : 'The request could not be read.' } });
    return;
  }
  // Logged once, by the request's log line (server/http/logger.ts): the error's class, codes and code
  // path with the request id, route pattern and ids — never its message, query parameters or the body.
  (res as { err?: unknown }).err = err;
  send(res, 500, { error: { code: 'internal', message: 'Something went wrong on the server. Try again.' } });
};
