import { z } from 'zod';

/** GET /api/notifications query: `unread=1` lists only unread notices; `limit` 1–100 (default 30). */
export const listNotificationsQuerySchema = z.object({
  unread: z.enum(['0', '1']).optional(),
  limit: z.coerce.number({ error: 'limit must be a number' }).int('limit must be a whole number').min(1, 'limit must be at least 1').max(100, 'limit must be at most 100').optional(),
});

/** POST /api/notifications/read: the notices to mark read, or all of them. */
export const markNotificationsReadSchema = z
  .object({
    ids: z.array(z.string().min(1, 'A notification id is empty').max(64, 'A notification id is too long')).min(1, 'Name at least one notification').max(200, 'At most 200 notifications at once').optional(),
    all: z.literal(true, { error: 'all must be true when given' }).optional(),
  })
  .refine((v) => (v.ids !== undefined) !== (v.all !== undefined), { message: 'Give either ids or all: true', path: ['ids'] });
export type MarkNotificationsReadInput = z.infer<typeof markNotificationsReadSchema>;

/** PATCH /api/account/preferences: the user's own unit system for their screens; null follows the team's. */
export const preferencesSchema = z.object({
  unitSystem: z.enum(['metric', 'us'], { error: 'Unit system must be metric, us or null (follow the team)' }).nullable(),
});
export type PreferencesInput = z.infer<typeof preferencesSchema>;
