import { z } from 'zod';

export const createProjectSchema = z.object({
  teamId: z.string().min(1, 'Team is required'),
  name: z.string().trim().min(2, 'Project name must be at least 2 characters').max(120, 'Project name is too long'),
  site: z.string().trim().max(200, 'Site is too long').default(''),
  description: z.string().trim().max(2000, 'Description is too long').default(''),
});
export type CreateProjectInput = z.infer<typeof createProjectSchema>;

export const updateProjectSchema = z
  .object({
    name: z.string().trim().min(2, 'Project name must be at least 2 characters').max(120, 'Project name is too long'),
    site: z.string().trim().max(200, 'Site is too long'),
    description: z.string().trim().max(2000, 'Description is too long'),
  })
  .partial()
  .refine((v) => Object.keys(v).length > 0, { message: 'Nothing to update' });
