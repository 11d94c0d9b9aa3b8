import type { RequestHandler } from 'express';
import type { Config } from '../config';
import type { Sessions } from '../auth/sessions';
import { ApiError } from './errors';
import type { FieldErrors } from '../../shared/schemas/errors';
import { secureCookies } from './context';
import { findInputProblems, TEXT_RULE_MESSAGES } from '../../shared/schemas/text';

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

/**
 * The input rules every JSON body meets before any route sees it (shared/schemas/text.ts): no NUL, no
 * lone UTF-16 surrogate (in text or in a field name), finite numbers, at most MAX_JSON_DEPTH levels of
 * nesting. The walk is iterative, so a problem is found at any depth. Applied once here, at the edge, so
 * every route is covered: a body breaking a rule is refused with 400 `validation_failed` naming each
 * field, instead of failing in the database (500). OWASP ASVS 5.0 2.2.1 (input validated on the server).
 * PostgreSQL text and jsonb cannot hold U+0000, so a NUL in the URL (`%00`) is refused too.
 */
export const inputRules: RequestHandler = (req, _res, next) => {
  if (/%00/i.test(req.originalUrl)) {
    return next(new ApiError(400, 'validation_failed', 'The address contains a NUL character.', { fields: { '': [TEXT_RULE_MESSAGES.nul] } }));
  }
  if (req.body === undefined || req.body === null || typeof req.body !== 'object') return next();
  const problems = findInputProblems(req.body);
  if (problems.length === 0) return next();
  const fields: FieldErrors = {};
  for (const p of problems) (fields[p.path] ??= []).push(p.message);
  next(new ApiError(400, 'validation_failed', 'Some fields need attention.', { fields }));
};
