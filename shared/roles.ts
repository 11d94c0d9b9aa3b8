/**
 * Team roles and what each may do. The server enforces these on every route;
 * the client uses the same table to hide what a role cannot do.
 */
export const ROLES = ['owner', 'designer', 'reviewer', 'trainer', 'viewer'] as const;
export type Role = (typeof ROLES)[number];

export const PERMISSIONS = [
  'team.manage', // members, invites, roles, team settings
  'project.read',
  'project.create',
  'project.edit', // rename, describe, delete projects
  'diagram.edit', // electrical edits to diagrams, saving revisions
  'diagram.annotate', // annotation layer only, never the electrical model
  'diagram.export',
  'review.comment',
  'review.decide', // approve or request changes
  'outbox.read', // the local fake mail outbox (demo mode)
] as const;
export type Permission = (typeof PERMISSIONS)[number];

const GRANTS: Record<Role, readonly Permission[]> = {
  owner: PERMISSIONS,
  designer: ['project.read', 'project.create', 'project.edit', 'diagram.edit', 'diagram.annotate', 'diagram.export', 'review.comment'],
  reviewer: ['project.read', 'diagram.export', 'review.comment', 'review.decide'],
  trainer: ['project.read', 'diagram.annotate', 'diagram.export', 'review.comment'],
  viewer: ['project.read', 'diagram.export'],
};

export function can(role: Role | null | undefined, permission: Permission): boolean {
  if (!role) return false;
  return GRANTS[role].includes(permission);
}

export const ROLE_LABELS: Record<Role, string> = {
  owner: 'Owner',
  designer: 'Designer',
  reviewer: 'Reviewer',
  trainer: 'Trainer',
  viewer: 'Viewer',
};

export const ROLE_DESCRIPTIONS: Record<Role, string> = {
  owner: 'Manages members and settings; can do everything.',
  designer: 'Creates and edits projects and diagrams.',
  reviewer: 'Reads, comments, approves or requests changes; no edits.',
  trainer: 'Reads, annotates and exports for crew briefings; no electrical edits.',
  viewer: 'Reads and exports only.',
};
