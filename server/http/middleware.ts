import type { RequestHandler } from 'express';
import type { Config } from '../config';
import type { Sessions } from '../auth/sessions';
import { ApiError } from './errors';
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
    const id = sessions.readSessionId(req.headers.cookie);
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
