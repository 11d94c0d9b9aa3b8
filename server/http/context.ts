/** What the app's middleware hands to routes (res.locals is untyped, so keep it in one place). */
import type { Request, Response } from 'express';
import type { Config } from '../config';
import type { Db } from '../db/client';
import type { Mailer } from '../mail/mailer';
import type { SignInLimiter } from '../auth/rate-limit';
import type { ActiveSession, Sessions, SessionUser } from '../auth/sessions';
import type { UploadStorage } from '../storage/types';
import type { AnalysisPool } from '../services/analysis-pool';
import { unauthenticated } from './errors';

export interface AppDeps {
  db: Db;
  mailer: Mailer;
  config: Config;
  sessions: Sessions;
  limiter: SignInLimiter;
  /** Where uploaded files' bytes live (server/storage). */
  storage: UploadStorage;
  /** Worker threads for the electrical analyses (server/services/analysis-pool.ts). */
  analysis: AnalysisPool;
}

export interface Auth {
  user: SessionUser;
  session: ActiveSession;
}

export function authOf(res: Response): Auth | null {
  return (res.locals.auth as Auth | undefined) ?? null;
}

/** The signed-in user, or 401 unauthenticated. */
export function requireAuth(res: Response): Auth {
  const auth = authOf(res);
  if (!auth) throw unauthenticated();
  return auth;
}

/** Whether cookies should carry Secure: APP_ORIGIN is https, or this request came over https. */
export function secureCookies(req: Request, config: Config): boolean {
  return config.appOrigin.startsWith('https:') || req.secure;
}
