import type { z } from 'zod';
import type { FieldErrors } from '@shared/schemas/errors';
import { isApiError } from './api';

export type ParseResult<T> = { ok: true; data: T } | { ok: false; fieldErrors: FieldErrors };

/** Validates form values with a shared zod schema and returns field errors keyed by path. */
export function parseForm<S extends z.ZodType>(schema: S, values: unknown): ParseResult<z.output<S>> {
  const result = schema.safeParse(values);
  if (result.success) return { ok: true, data: result.data };
  const fieldErrors: FieldErrors = {};
  for (const issue of result.error.issues) {
    const key = issue.path.length ? issue.path.join('.') : '_form';
    // One message per field at a time: the first rule broken is the one to fix.
    fieldErrors[key] ??= [issue.message];
  }
  return { ok: false, fieldErrors };
}

/** Splits a mutation error into field errors (validation_failed) and a form-level message. */
export function serverFormErrors(error: unknown): { fieldErrors: FieldErrors; formError: string | null } {
  if (!error) return { fieldErrors: {}, formError: null };
  if (isApiError(error)) {
    const fieldErrors = error.fieldErrors;
    if (error.code === 'validation_failed' && Object.keys(fieldErrors).length > 0) {
      return { fieldErrors, formError: null };
    }
    if (error.status === 429 && error.retryAfterSeconds) {
      const minutes = Math.ceil(error.retryAfterSeconds / 60);
      return {
        fieldErrors,
        formError: `${error.message} Try again in ${minutes <= 1 ? 'about a minute' : `${minutes} minutes`}.`,
      };
    }
    return { fieldErrors, formError: error.message };
  }
  return { fieldErrors: {}, formError: error instanceof Error ? error.message : 'Something went wrong.' };
}
