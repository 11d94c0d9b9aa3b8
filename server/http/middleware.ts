import type { RequestHandler } from 'express';
import type { Config } from '../config';
import type { Sessions } from '../auth/sessions';
import { ApiError } from './errors';
import type { FieldErrors } from '../../shared/schemas/errors';
import { secureCookies } from './context';

const MUTATING = new Set(['POST', 'PUT', 'PATCH', 'DELETE']);

/**
 * Cross-site request forgery guard. A mutating request that carries the session cookie (or any
 * Origin at all) must come from the app itself: Origin equal to APP_ORIGIN or to the request's own
 * scheme://host, or Sec-Fetch-Site: same-origin. Requests without cookie and without Origin
 * (scripts, curl) pass: there is no ambient credential to abuse.
 */
export function originCheck(config: Config, sessions: Sessions): RequestHandler {
  return (req, _res, next) => {
    if (!MUTATING.has(req.method)) return next();
    const hasSession = sessions.readSessionId(req.headers.cookie) !== null;
    const origin = req.get('origin');
    if (!hasSession && origin === undefined) return next();
    if (req.get('sec-fetch-site') === 'same-origin') return next();
    if (origin && (origin === config.appOrigin || origin === `${req.protocol}://${req.get('host')}`)) return next();
    next(
      new ApiError(403, 'origin_rejected', 'This request did not come from the Bankwright app, so it was refused.', {
        origin: origin ?? null,
      }),
    );
  };
}

/** Loads the session from the cookie into res.locals.auth; refreshes or clears the cookie as needed. */
export function sessionLoader(config: Config, sessions: Sessions): RequestHandler {
  return async (req, res, next) => {
    const raw = sessions.readSessionId(req.headers.cookie);
    // Session ids are lucia's lowercase base32; anything else cannot be one (and must not reach SQL).
    const id = raw && /^[a-z0-9]{1,128}$/.test(raw) ? raw : null;
    if (!id) return next();
    const found = await sessions.validateSession(id);
    const secure = secureCookies(req, config);
    if (!found) {
      const c = sessions.blankCookie(secure);
      res.cookie(c.name, c.value, c.options);
      return next();
    }
    res.locals.auth = found;
    if (found.session.refreshed) {
      const c = sessions.sessionCookie(found.session, secure);
      res.cookie(c.name, c.value, c.options);
    }
    next();
  };
}

/** API responses are per-user: never cache them. */
export const noStore: RequestHandler = (_req, res, next) => {
  res.set('Cache-Control', 'no-store');
  next();
};

const NUL_MESSAGE = 'Text must not contain NUL characters';

function collectNul(value: unknown, path: string[], out: FieldErrors, depth = 0): void {
  if (depth > 64) return;
  if (typeof value === 'string') {
    if (value.includes('\u0000')) out[path.join('.')] = [NUL_MESSAGE];
  } else if (Array.isArray(value)) {
    value.forEach((v, i) => collectNul(v, [...path, String(i)], out, depth + 1));
  } else if (value && typeof value === 'object') {
    for (const [k, v] of Object.entries(value)) {
      if (k.includes('\u0000')) out[[...path, k].join('.')] = [NUL_MESSAGE];
      collectNul(v, [...path, k], out, depth + 1);
    }
  }
}

/**
 * PostgreSQL text and jsonb cannot hold U+0000, so a NUL anywhere in the URL or the JSON body would
 * fail in the database (500). Refuse it up front as the user's mistake it is.
 */
export const rejectNul: RequestHandler = (req, _res, next) => {
  if (/%00/i.test(req.originalUrl)) {
    return next(new ApiError(400, 'validation_failed', 'The address contains a NUL character.', { fields: { '': [NUL_MESSAGE] } }));
  }
  const fields: FieldErrors = {};
  collectNul(req.body, [], fields);
  if (Object.keys(fields).length > 0) return next(new ApiError(400, 'validation_failed', 'Some fields need attention.', { fields }));
  next();
};
