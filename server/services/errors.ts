/**
 * Errors the services raise, in the domain's terms: what went wrong (`kind`), a stable machine code
 * and a message naming the field or thing. The services know nothing of HTTP; server/http/errors.ts maps
 * each kind to one status code, once, and sends the API's one error shape {"error":{code,message,details}}.
 */
import type { z } from 'zod';
import type { FieldErrors } from '../../shared/schemas/errors';

export type DomainErrorKind =
  /** The thing does not exist, or the caller may not know that it does. */
  | 'not_found'
  /** The caller is known but their role does not allow this. */
  | 'forbidden'
  /** The caller's credentials were not accepted. */
  | 'unauthenticated'
  /** The request clashes with the current state (taken, locked, last owner …). */
  | 'conflict'
  /** A field is wrong; details.fields names each one. */
  | 'invalid'
  /** Well-formed, but the content cannot be processed (an invalid document, a damaged file, a full library). */
  | 'unprocessable'
  /** Larger than the server handles (a network past the element limit). */
  | 'too_large'
  /** A file type the server does not take. */
  | 'unsupported'
  /** Too many attempts in the window; `retryAfter_s` says when to try again. */
  | 'rate_limited'
  /** A service this one depends on (the mail relay) failed; nothing was changed. */
  | 'upstream_failed'
  /** The server cannot take the work now (queue full, stopping); `retryAfter_s` when known. */
  | 'unavailable'
  /** The work ran past the server's time limit and was stopped. */
  | 'timeout'
  /** The work failed on the server's side (not the caller's input). */
  | 'failed';

export class DomainError extends Error {
  constructor(
    readonly kind: DomainErrorKind,
    readonly code: string,
    message: string,
    readonly details?: unknown,
    /** Seconds until a retry can succeed (rate_limited); sent as Retry-After. */
    readonly retryAfter_s?: number,
  ) {
    super(message);
    this.name = 'DomainError';
  }
}

export const notFound = (what = 'Not found.') => new DomainError('not_found', 'not_found', what);
export const forbidden = (message = 'Your role in this team does not allow this.') => new DomainError('forbidden', 'forbidden', message);
export const conflict = (code: string, message: string, details?: unknown) => new DomainError('conflict', code, message, details);
export const tooLarge = (code: string, message: string, details?: unknown) => new DomainError('too_large', code, message, details);
export const unprocessable = (code: string, message: string, details?: unknown) => new DomainError('unprocessable', code, message, details);

/** zod issues -> { "path.to.field": ["message", ...] } ("" for the body as a whole). */
export function fieldErrors(error: z.ZodError): FieldErrors {
  const fields: FieldErrors = {};
  for (const issue of error.issues) {
    const key = issue.path.map(String).join('.');
    (fields[key] ??= []).push(issue.message);
  }
  return fields;
}

/** One or more fields need attention: { fields: { "path": ["message"] } }. */
export const invalidFields = (fields: FieldErrors, message = 'Some fields need attention.') =>
  new DomainError('invalid', 'validation_failed', message, { fields });

export const validationFailed = (error: z.ZodError) => invalidFields(fieldErrors(error));
