import { z } from 'zod';
import { ROLES } from '../roles';
import { emailSchema, unitSystemSchema } from './auth';

export const roleSchema = z.enum(ROLES);

export const createTeamSchema = z.object({
  name: z.string().trim().min(2, 'Team name must be at least 2 characters').max(80, 'Team name is too long'),
  unitSystem: unitSystemSchema.default('metric'),
});
export type CreateTeamInput = z.infer<typeof createTeamSchema>;

export const updateTeamSchema = z.object({
  name: z.string().trim().min(2, 'Team name must be at least 2 characters').max(80, 'Team name is too long').optional(),
  unitSystem: unitSystemSchema.optional(),
});

export const inviteSchema = z.object({
  email: emailSchema,
  role: roleSchema,
});
export type InviteInput = z.infer<typeof inviteSchema>;

export const changeRoleSchema = z.object({ role: roleSchema });

export const acceptInviteSchema = z.object({
  token: z.string().min(10, 'Invite token is missing').max(200),
});
