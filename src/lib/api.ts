import type { FieldErrors } from '@shared/schemas/errors';

/** An error answer from the API, parsed from {"error":{"code","message","details"}}. */
export class ApiError extends Error {
  readonly status: number;
  readonly code: string;
  readonly details: unknown;

  constructor(status: number, code: string, message: string, details?: unknown) {
    super(message);
    this.name = 'ApiError';
    this.status = status;
    this.code = code;
    this.details = details;
  }

  /** Field errors sent with validation_failed (details.fields), or an empty object. */
  get fieldErrors(): FieldErrors {
    const fields = (this.details as { fields?: unknown } | null | undefined)?.fields;
    if (!fields || typeof fields !== 'object') return {};
    const out: FieldErrors = {};
    for (const [path, messages] of Object.entries(fields as Record<string, unknown>)) {
      if (Array.isArray(messages)) out[path] = messages.filter((m): m is string => typeof m === 'string');
      else if (typeof messages === 'string') out[path] = [messages];
    }
    return out;
  }

  /** Seconds from Retry-After on 429 answers, when the server sent it. */
  retryAfterSeconds?: number;
}

export function isApiError(error: unknown): error is ApiError {
  return error instanceof ApiError;
}

type Method = 'GET' | 'POST' | 'PATCH' | 'PUT' | 'DELETE';

export interface RequestOptions {
  method?: Method;
  body?: unknown;
  signal?: AbortSignal;
}

/**
 * fetch wrapper for /api: sends the session cookie, JSON in and out, and throws ApiError on any
 * non-2xx answer. Network failures become ApiError with status 0 and code "network".
 */
export async function api<T>(path: string, options: RequestOptions = {}): Promise<T> {
  const { method = 'GET', body, signal } = options;
  const headers: Record<string, string> = { Accept: 'application/json' };
  if (body !== undefined) headers['Content-Type'] = 'application/json';

  let response: Response;
  try {
    response = await fetch(path, {
      method,
      headers,
      body: body === undefined ? undefined : JSON.stringify(body),
      credentials: 'same-origin',
      signal,
    });
  } catch (cause) {
    if ((cause as { name?: string })?.name === 'AbortError') throw cause;
    throw new ApiError(0, 'network', 'The server could not be reached. Check the connection and try again.');
  }

  if (response.status === 204) return undefined as T;

  const text = await response.text();
  let data: unknown = undefined;
  if (text) {
    try {
      data = JSON.parse(text);
    } catch {
      data = undefined;
    }
  }

  if (!response.ok) {
    const err = (data as { error?: { code?: unknown; message?: unknown; details?: unknown } } | undefined)?.error;
    const apiError = new ApiError(
      response.status,
      typeof err?.code === 'string' ? err.code : fallbackCode(response.status),
      typeof err?.message === 'string' ? err.message : `The server answered ${response.status}.`,
      err?.details,
    );
    const retryAfter = Number(response.headers.get('Retry-After'));
    if (Number.isFinite(retryAfter) && retryAfter > 0) apiError.retryAfterSeconds = retryAfter;
    throw apiError;
  }
  return data as T;
}

function fallbackCode(status: number): string {
  if (status === 401) return 'unauthenticated';
  if (status === 403) return 'forbidden';
  if (status === 404) return 'not_found';
  if (status === 429) return 'too_many_attempts';
  if (status >= 500) return 'internal';
  return 'error';
}

/** A short message to show for any thrown value. */
export function errorMessage(error: unknown): string {
  if (isApiError(error)) return error.message;
  if (error instanceof Error && error.message) return error.message;
  return 'Something went wrong.';
}
