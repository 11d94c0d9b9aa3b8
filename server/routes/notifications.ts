/**
 * The signed-in user's own notices, the work waiting for them, their own captured mail and their preferences.
 * Every query is keyed by the session's user id, never by an id from the request (OWASP ASVS 5.0 8.2.2).
 */
import { Router } from 'express';
import { listNotificationsQuerySchema, markNotificationsReadSchema, preferencesSchema } from '../../shared/schemas/notifications';
import { requireAuth, type AppDeps } from '../http/context';
import { notFound } from '../http/errors';
import { parse } from '../http/validate';
import { listNotifications, listOwnOutbox, listWork, markRead, unreadCount } from '../services/notifications';
import { getPreferences, setPreferences } from '../services/preferences';

export function notificationRoutes(deps: AppDeps): Router {
  const { db, mailer } = deps;
  const r = Router();

  r.get('/notifications', async (req, res) => {
    const { user } = requireAuth(res);
    const q = parse(listNotificationsQuerySchema, req.query);
    const [items, unread] = await Promise.all([
      listNotifications(db, user.id, { unreadOnly: q.unread === '1', limit: q.limit ?? 30 }),
      unreadCount(db, user.id),
    ]);
    res.json({ notifications: items, unread });
  });

  r.post('/notifications/read', async (req, res) => {
    const { user } = requireAuth(res);
    const input = parse(markNotificationsReadSchema, req.body);
    res.json({ unread: await markRead(db, user.id, input) });
  });

  r.get('/work', async (_req, res) => {
    const { user } = requireAuth(res);
    res.json(await listWork(db, user.id));
  });

  // Without a mail server every user reads the mail captured for them; owners still read the team's whole outbox.
  r.get('/account/outbox', async (_req, res) => {
    const { user } = requireAuth(res);
    if (mailer.mode !== 'outbox') throw notFound('Mail is sent by SMTP; there is no local outbox.');
    res.json({ messages: await listOwnOutbox(db, user.id) });
  });

  r.get('/account/preferences', async (_req, res) => {
    const { user } = requireAuth(res);
    res.json({ preferences: await getPreferences(db, user.id) });
  });

  r.patch('/account/preferences', async (req, res) => {
    const { user } = requireAuth(res);
    const input = parse(preferencesSchema, req.body);
    res.json({ preferences: await setPreferences(db, user.id, input) });
  });

  return r;
}
