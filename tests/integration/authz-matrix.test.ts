/**
 * Authorization matrix: EVERY API route × every demo role, a member of another team, and signed out.
 *
 * The expected status of each cell comes from the permission table written out below (deliberately
 * not computed with shared/roles.ts `can()`), the route's requirement and its success status:
 *   signed out -> 401 (except public routes); not a member of the route's team -> 404;
 *   a member whose role lacks the permission -> 403; otherwise the route's success status.
 * Routes that change or end things get fresh fixtures (and, where needed, a fresh session) per cell.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { eq } from 'drizzle-orm';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { diagramRevisions, diagrams, invites, libraryItems, memberships, projects, reviewComments, teams, uploads, users } from '../../server/db/schema';
import { newStorageKey } from '../../server/storage';
import { newId, newToken, sha256Hex } from '../../server/ids';
import { hashPassword } from '../../server/auth/passwords';
import { makeTestApp, DEMO_PASSWORD, type Agent, type TestApp } from '../helpers/app';
import { smallBank } from './fixtures';
import { multipart, png } from './upload-fixtures';

const ROLES = ['owner', 'designer', 'reviewer', 'trainer', 'viewer'] as const;
type DemoRole = (typeof ROLES)[number];
const ACTORS = [...ROLES, 'outsider', 'anon'] as const;
type Actor = (typeof ACTORS)[number];

/** Which roles hold each permission the foundation routes use (written out, not imported). */
const GRANTED: Record<string, readonly DemoRole[]> = {
  'team.manage': ['owner'],
  'project.read': ['owner', 'designer', 'reviewer', 'trainer', 'viewer'],
  'project.create': ['owner', 'designer'],
  'project.edit': ['owner', 'designer'],
  'outbox.read': ['owner'],
  'diagram.edit': ['owner', 'designer'],
  'review.comment': ['owner', 'designer', 'reviewer', 'trainer'],
  'review.decide': ['owner', 'reviewer'],
  'diagram.annotate': ['owner', 'designer', 'trainer'],
  /** Uploads (docs/api.md): owners, designers and trainers attach files. */
  'upload.create': ['owner', 'designer', 'trainer'],
  /** Deleting an upload: its uploader (a trainer here) or an owner or designer. */
  'upload.delete': ['owner', 'designer', 'trainer'],
};

type Requirement =
  | { kind: 'public' } // anyone, signed in or not
  | { kind: 'signedIn' } // any signed-in user
  | { kind: 'member' } // any member of the route's team
  | { kind: 'permission'; permission: keyof typeof GRANTED };

interface Call {
  method: 'get' | 'post' | 'put' | 'patch' | 'delete';
  url: string;
  body?: unknown;
  /** Content-Type for a raw (Buffer) body, e.g. multipart. */
  type?: string;
}

interface RouteCase {
  route: string;
  requires: Requirement;
  success: number;
  /** Sign in afresh for each cell (the call changes or ends the session). */
  freshSession?: boolean;
  call(actor: Actor, agent: Agent): Promise<Call>;
}

function expected(c: RouteCase, actor: Actor): number {
  const r = c.requires;
  if (r.kind === 'public') return c.success;
  if (actor === 'anon') return 401;
  if (r.kind === 'signedIn') return c.success;
  if (actor === 'outsider') return 404;
  if (r.kind === 'member') return c.success;
  return GRANTED[r.permission].includes(actor) ? c.success : 403;
}

let t: TestApp;
let teamId: string;
let projectId: string;
let diagramId: string;
const userIds: Record<string, string> = {};
const OUTSIDER_EMAIL = 'outsider@elsewhere.test';
const OUTSIDER_PASSWORD = 'outsider password 1';
let placeholderHash: string;
let seq = 0;
const unique = (prefix: string) => `${prefix}${++seq}`;

function emailOf(actor: Actor): string {
  return actor === 'outsider' ? OUTSIDER_EMAIL : actor === 'anon' ? 'viewer@demo.test' : `${actor}@demo.test`;
}
function passwordOf(actor: Actor): string {
  return actor === 'outsider' ? OUTSIDER_PASSWORD : DEMO_PASSWORD;
}

// Fixtures written straight to the database so each cell starts from the same state.
async function freshProject(): Promise<string> {
  const id = newId();
  await t.db.insert(projects).values({ id, teamId, name: unique('Matrix project ') });
  return id;
}
async function freshDiagram(): Promise<string> {
  const id = newId();
  await t.db.insert(diagrams).values({ id, projectId, name: unique('Matrix diagram '), content: smallBank() });
  return id;
}
/** A diagram with one revision (by the designer) in the given review state. */
async function freshRevision(state: 'draft' | 'in_review' = 'draft'): Promise<{ diagramId: string; revisionId: string }> {
  const diagramId = await freshDiagram();
  const revisionId = newId();
  await t.db.insert(diagramRevisions).values({ id: revisionId, diagramId, number: 1, authorId: userIds.designer, content: smallBank(), contentHash: 'matrix', resultsSummary: {}, state });
  return { diagramId, revisionId };
}
/** A comment on a fresh revision, written by the actor when they may comment (else by the owner). */
async function freshComment(actor: Actor): Promise<{ diagramId: string; commentId: string }> {
  const { diagramId, revisionId } = await freshRevision();
  const commentId = newId();
  const author = GRANTED['review.comment'].includes(actor as DemoRole) ? userIds[actor] : userIds.owner;
  await t.db.insert(reviewComments).values({ id: commentId, revisionId, authorId: author, body: 'Matrix comment' });
  return { diagramId, commentId };
}
async function freshMember(): Promise<string> {
  const id = newId();
  await t.db.insert(users).values({ id, email: `${unique('member')}@matrix.test`, name: 'Matrix member', passwordHash: placeholderHash });
  await t.db.insert(memberships).values({ teamId, userId: id, role: 'viewer' });
  return id;
}
async function freshInvite(inTeam: string, email: string): Promise<{ id: string; token: string }> {
  const id = newId();
  const token = newToken();
  await t.db.insert(invites).values({ id, teamId: inTeam, tokenHash: sha256Hex(token), email, role: 'viewer', expiresAt: new Date(Date.now() + 86_400_000) });
  return { id, token };
}
/** A new team in which every demo account has its demo role (so deleting it hurts nothing else). */
async function freshTeamLikeDemo(): Promise<string> {
  const id = newId();
  await t.db.insert(teams).values({ id, name: unique('Matrix team ') });
  const demo = await t.db.select().from(memberships).where(eq(memberships.teamId, teamId));
  await t.db.insert(memberships).values(demo.filter((m) => ROLES.includes(m.role as DemoRole)).map((m) => ({ teamId: id, userId: m.userId, role: m.role })));
  return id;
}
/** A stored upload in the demo project, attached by the actor when they may upload (else by the designer). */
async function freshUpload(actor: Actor): Promise<string> {
  const id = newId();
  const uploader = GRANTED['upload.create'].includes(actor as DemoRole) ? userIds[actor] : userIds.designer;
  const key = newStorageKey();
  const bytes = png(2, 2);
  fs.mkdirSync(path.join(dataDir, 'uploads', key.slice(0, 2)), { recursive: true });
  fs.writeFileSync(path.join(dataDir, 'uploads', key.slice(0, 2), key), bytes);
  await t.db.insert(uploads).values({ id, projectId, key, fileName: 'matrix.png', contentType: 'image/png', size: bytes.length, width: 2, height: 2, uploadedBy: uploader });
  return id;
}
async function freshLibraryItem(): Promise<string> {
  const id = newId();
  await t.db.insert(libraryItems).values({ id, teamId, kind: 'fuse', name: unique('Matrix fuse '), props: { fuseClass: 'anl', rating_A: 150, voltage_rating_V: 32, interrupting_A: 6000 } });
  return id;
}
const matrixFuse = { kind: 'fuse', name: 'Matrix ANL 100 A', props: { fuseClass: 'anl', rating_A: 100, voltage_rating_V: 32, interrupting_A: 6000 } };
async function emptyTeam(): Promise<string> {
  const id = newId();
  await t.db.insert(teams).values({ id, name: unique('Empty team ') });
  return id;
}

const ROUTES: RouteCase[] = [
  { route: 'GET /api/health', requires: { kind: 'public' }, success: 200, call: async () => ({ method: 'get', url: '/api/health' }) },
  {
    route: 'POST /api/auth/sign-up',
    requires: { kind: 'public' },
    success: 201,
    freshSession: true,
    call: async () => ({ method: 'post', url: '/api/auth/sign-up', body: { email: `${unique('signup')}@matrix.test`, password: 'matrix password', name: 'Matrix' } }),
  },
  {
    route: 'POST /api/auth/sign-in',
    requires: { kind: 'public' },
    success: 200,
    freshSession: true,
    call: async (actor) => ({ method: 'post', url: '/api/auth/sign-in', body: { email: emailOf(actor), password: passwordOf(actor) } }),
  },
  { route: 'POST /api/auth/sign-out', requires: { kind: 'public' }, success: 204, freshSession: true, call: async () => ({ method: 'post', url: '/api/auth/sign-out' }) },
  { route: 'GET /api/auth/me', requires: { kind: 'signedIn' }, success: 200, call: async () => ({ method: 'get', url: '/api/auth/me' }) },
  { route: 'PATCH /api/account', requires: { kind: 'signedIn' }, success: 200, call: async () => ({ method: 'patch', url: '/api/account', body: {} }) },
  {
    route: 'POST /api/account/password',
    requires: { kind: 'signedIn' },
    success: 204,
    freshSession: true,
    // Sets the same password again: the account stays usable for the other cells.
    call: async (actor) => ({ method: 'post', url: '/api/account/password', body: { currentPassword: passwordOf(actor), newPassword: passwordOf(actor), endOtherSessions: false } }),
  },
  {
    route: 'PATCH /api/account/email',
    requires: { kind: 'signedIn' },
    success: 200,
    // The actor's own address again: accepted unchanged, so every account stays usable for the other cells.
    call: async (actor) => ({ method: 'patch', url: '/api/account/email', body: { email: emailOf(actor), currentPassword: passwordOf(actor) } }),
  },
  { route: 'GET /api/account/sessions', requires: { kind: 'signedIn' }, success: 200, call: async () => ({ method: 'get', url: '/api/account/sessions' }) },
  {
    route: 'DELETE /api/account/sessions/:id',
    requires: { kind: 'signedIn' },
    success: 204,
    freshSession: true,
    call: async (actor, agent) => {
      if (actor === 'anon') return { method: 'delete', url: '/api/account/sessions/any-id' };
      const list = await agent.get('/api/account/sessions');
      const current = list.body.sessions.find((s: { current: boolean }) => s.current);
      return { method: 'delete', url: `/api/account/sessions/${current.id}` };
    },
  },
  { route: 'GET /api/teams', requires: { kind: 'signedIn' }, success: 200, call: async () => ({ method: 'get', url: '/api/teams' }) },
  { route: 'POST /api/teams', requires: { kind: 'signedIn' }, success: 201, call: async () => ({ method: 'post', url: '/api/teams', body: { name: unique('New team '), unitSystem: 'us' } }) },
  { route: 'GET /api/teams/:teamId', requires: { kind: 'member' }, success: 200, call: async () => ({ method: 'get', url: `/api/teams/${teamId}` }) },
  {
    route: 'PATCH /api/teams/:teamId',
    requires: { kind: 'permission', permission: 'team.manage' },
    success: 200,
    call: async () => ({ method: 'patch', url: `/api/teams/${teamId}`, body: { unitSystem: 'metric' } }),
  },
  {
    route: 'DELETE /api/teams/:teamId',
    requires: { kind: 'permission', permission: 'team.manage' },
    success: 204,
    call: async () => ({ method: 'delete', url: `/api/teams/${await freshTeamLikeDemo()}` }),
  },
  { route: 'GET /api/teams/:teamId/members', requires: { kind: 'member' }, success: 200, call: async () => ({ method: 'get', url: `/api/teams/${teamId}/members` }) },
  {
    route: 'PATCH /api/teams/:teamId/members/:userId',
    requires: { kind: 'permission', permission: 'team.manage' },
    success: 200,
    call: async () => ({ method: 'patch', url: `/api/teams/${teamId}/members/${await freshMember()}`, body: { role: 'reviewer' } }),
  },
  {
    route: 'DELETE /api/teams/:teamId/members/:userId',
    requires: { kind: 'permission', permission: 'team.manage' },
    success: 204,
    call: async () => ({ method: 'delete', url: `/api/teams/${teamId}/members/${await freshMember()}` }),
  },
  {
    route: 'POST /api/teams/:teamId/invites',
    requires: { kind: 'permission', permission: 'team.manage' },
    success: 201,
    call: async () => ({ method: 'post', url: `/api/teams/${teamId}/invites`, body: { email: `${unique('invitee')}@matrix.test`, role: 'viewer' } }),
  },
  {
    route: 'DELETE /api/teams/:teamId/invites/:inviteId',
    requires: { kind: 'permission', permission: 'team.manage' },
    success: 204,
    call: async () => ({ method: 'delete', url: `/api/teams/${teamId}/invites/${(await freshInvite(teamId, `${unique('revoke')}@matrix.test`)).id}` }),
  },
  {
    route: 'GET /api/teams/:teamId/outbox',
    requires: { kind: 'permission', permission: 'outbox.read' },
    success: 200,
    call: async () => ({ method: 'get', url: `/api/teams/${teamId}/outbox` }),
  },
  // The caller's own notices, work list, captured mail and preferences: any signed-in user, keyed by the session's user.
  { route: 'GET /api/notifications', requires: { kind: 'signedIn' }, success: 200, call: async () => ({ method: 'get', url: '/api/notifications?unread=1' }) },
  { route: 'POST /api/notifications/read', requires: { kind: 'signedIn' }, success: 200, call: async () => ({ method: 'post', url: '/api/notifications/read', body: { all: true } }) },
  { route: 'GET /api/work', requires: { kind: 'signedIn' }, success: 200, call: async () => ({ method: 'get', url: '/api/work' }) },
  { route: 'GET /api/account/outbox', requires: { kind: 'signedIn' }, success: 200, call: async () => ({ method: 'get', url: '/api/account/outbox' }) },
  { route: 'GET /api/account/preferences', requires: { kind: 'signedIn' }, success: 200, call: async () => ({ method: 'get', url: '/api/account/preferences' }) },
  {
    route: 'PATCH /api/account/preferences',
    requires: { kind: 'signedIn' },
    success: 200,
    // Null (follow the team) leaves every account as the other cells expect it.
    call: async () => ({ method: 'patch', url: '/api/account/preferences', body: { unitSystem: null } }),
  },
  {
    route: 'GET /api/invites/:token',
    requires: { kind: 'signedIn' },
    success: 200,
    call: async () => ({ method: 'get', url: `/api/invites/${(await freshInvite(teamId, `${unique('look')}@matrix.test`)).token}` }),
  },
  {
    route: 'POST /api/invites/accept',
    requires: { kind: 'signedIn' },
    success: 200,
    // An invite addressed to the actor, into a throwaway team.
    call: async (actor) => ({ method: 'post', url: '/api/invites/accept', body: { token: (await freshInvite(await emptyTeam(), emailOf(actor))).token } }),
  },
  {
    route: 'GET /api/projects?teamId=',
    requires: { kind: 'permission', permission: 'project.read' },
    success: 200,
    call: async () => ({ method: 'get', url: `/api/projects?teamId=${teamId}` }),
  },
  {
    route: 'POST /api/projects',
    requires: { kind: 'permission', permission: 'project.create' },
    success: 201,
    call: async () => ({ method: 'post', url: '/api/projects', body: { teamId, name: unique('Created project '), site: 'Matrix site' } }),
  },
  {
    route: 'GET /api/projects/:id',
    requires: { kind: 'permission', permission: 'project.read' },
    success: 200,
    call: async () => ({ method: 'get', url: `/api/projects/${projectId}` }),
  },
  {
    route: 'PATCH /api/projects/:id',
    requires: { kind: 'permission', permission: 'project.edit' },
    success: 200,
    call: async () => ({ method: 'patch', url: `/api/projects/${await freshProject()}`, body: { description: 'Edited in the matrix' } }),
  },
  {
    route: 'DELETE /api/projects/:id',
    requires: { kind: 'permission', permission: 'project.edit' },
    success: 204,
    call: async () => ({ method: 'delete', url: `/api/projects/${await freshProject()}` }),
  },
  {
    route: 'GET /api/projects/:id/diagrams',
    requires: { kind: 'permission', permission: 'project.read' },
    success: 200,
    call: async () => ({ method: 'get', url: `/api/projects/${projectId}/diagrams` }),
  },
  {
    route: 'POST /api/projects/:id/diagrams',
    requires: { kind: 'permission', permission: 'diagram.edit' },
    success: 201,
    call: async () => ({ method: 'post', url: `/api/projects/${projectId}/diagrams`, body: { name: unique('Created diagram ') } }),
  },
  {
    route: 'GET /api/diagrams/:id',
    requires: { kind: 'permission', permission: 'project.read' },
    success: 200,
    call: async () => ({ method: 'get', url: `/api/diagrams/${diagramId}` }),
  },
  {
    route: 'PUT /api/diagrams/:id/working-copy',
    requires: { kind: 'permission', permission: 'diagram.edit' },
    success: 200,
    call: async () => ({ method: 'put', url: `/api/diagrams/${await freshDiagram()}/working-copy`, body: { content: smallBank('Matrix edit'), baseVersion: 1 } }),
  },
  {
    route: 'PATCH /api/diagrams/:id',
    requires: { kind: 'permission', permission: 'diagram.edit' },
    success: 200,
    call: async () => ({ method: 'patch', url: `/api/diagrams/${await freshDiagram()}`, body: { description: 'Edited in the matrix' } }),
  },
  {
    route: 'DELETE /api/diagrams/:id',
    requires: { kind: 'permission', permission: 'diagram.edit' },
    success: 204,
    call: async () => ({ method: 'delete', url: `/api/diagrams/${await freshDiagram()}` }),
  },
  {
    route: 'GET /api/projects/:id/activity',
    requires: { kind: 'permission', permission: 'project.read' },
    success: 200,
    call: async () => ({ method: 'get', url: `/api/projects/${projectId}/activity` }),
  },
  {
    route: 'POST /api/diagrams/:id/duplicate',
    requires: { kind: 'permission', permission: 'diagram.edit' },
    success: 201,
    call: async () => ({ method: 'post', url: `/api/diagrams/${diagramId}/duplicate`, body: { name: unique('Duplicated diagram ') } }),
  },
  {
    route: 'POST /api/diagrams/:id/move',
    requires: { kind: 'permission', permission: 'diagram.edit' },
    success: 200,
    call: async () => ({ method: 'post', url: `/api/diagrams/${await freshDiagram()}/move`, body: { projectId: await freshProject() } }),
  },
  {
    route: 'POST /api/diagrams/:id/copy',
    requires: { kind: 'permission', permission: 'diagram.edit' },
    success: 201,
    call: async () => ({ method: 'post', url: `/api/diagrams/${diagramId}/copy`, body: { projectId: await freshProject() } }),
  },
  {
    route: 'POST /api/diagrams/:id/check',
    requires: { kind: 'permission', permission: 'project.read' },
    success: 200,
    call: async () => ({ method: 'post', url: `/api/diagrams/${diagramId}/check`, body: { content: smallBank() } }),
  },
  {
    route: 'GET /api/diagrams/:id/revisions',
    requires: { kind: 'permission', permission: 'project.read' },
    success: 200,
    call: async () => ({ method: 'get', url: `/api/diagrams/${diagramId}/revisions` }),
  },
  {
    route: 'POST /api/diagrams/:id/revisions',
    requires: { kind: 'permission', permission: 'diagram.edit' },
    success: 201,
    call: async () => ({ method: 'post', url: `/api/diagrams/${await freshDiagram()}/revisions`, body: { baseRevision: null, message: 'Matrix save', content: smallBank() } }),
  },
  {
    route: 'GET /api/diagrams/:id/revisions/:n',
    requires: { kind: 'permission', permission: 'project.read' },
    success: 200,
    call: async () => ({ method: 'get', url: `/api/diagrams/${(await freshRevision()).diagramId}/revisions/1` }),
  },
  {
    route: 'POST /api/diagrams/:id/revisions/:n/restore',
    requires: { kind: 'permission', permission: 'diagram.edit' },
    success: 201,
    call: async () => ({ method: 'post', url: `/api/diagrams/${(await freshRevision()).diagramId}/revisions/1/restore`, body: {} }),
  },
  {
    route: 'POST /api/diagrams/:id/revisions/:n/review-requests',
    requires: { kind: 'permission', permission: 'diagram.edit' },
    success: 200,
    call: async () => ({ method: 'post', url: `/api/diagrams/${(await freshRevision()).diagramId}/revisions/1/review-requests`, body: { reviewerIds: [userIds.reviewer] } }),
  },
  {
    route: 'GET /api/diagrams/:id/revisions/:n/comments',
    requires: { kind: 'permission', permission: 'project.read' },
    success: 200,
    call: async (actor) => ({ method: 'get', url: `/api/diagrams/${(await freshComment(actor)).diagramId}/revisions/1/comments` }),
  },
  {
    route: 'POST /api/diagrams/:id/revisions/:n/comments',
    requires: { kind: 'permission', permission: 'review.comment' },
    success: 201,
    call: async () => ({ method: 'post', url: `/api/diagrams/${(await freshRevision()).diagramId}/revisions/1/comments`, body: { body: 'Matrix comment', partId: 'bat1' } }),
  },
  {
    route: 'PATCH /api/diagrams/:id/revisions/:n/comments/:commentId',
    requires: { kind: 'permission', permission: 'review.comment' },
    success: 200,
    // The actor's own comment (resolving is for its author, designers and owners).
    call: async (actor) => {
      const { diagramId: d, commentId } = await freshComment(actor);
      return { method: 'patch', url: `/api/diagrams/${d}/revisions/1/comments/${commentId}`, body: { resolved: true } };
    },
  },
  {
    route: 'POST /api/diagrams/:id/revisions/:n/decision',
    requires: { kind: 'permission', permission: 'review.decide' },
    success: 200,
    call: async () => ({ method: 'post', url: `/api/diagrams/${(await freshRevision('in_review')).diagramId}/revisions/1/decision`, body: { decision: 'approve' } }),
  },
  {
    route: 'PUT /api/diagrams/:id/annotations',
    requires: { kind: 'permission', permission: 'diagram.annotate' },
    success: 200,
    call: async () => ({ method: 'put', url: `/api/diagrams/${await freshDiagram()}/annotations`, body: { annotations: [{ id: 'an1', kind: 'note', position: { x: 0, y: 0 }, text: 'Matrix note' }], baseVersion: 1 } }),
  },
  {
    route: 'GET /api/projects/:id/uploads',
    requires: { kind: 'permission', permission: 'project.read' },
    success: 200,
    call: async () => ({ method: 'get', url: `/api/projects/${projectId}/uploads` }),
  },
  {
    route: 'POST /api/projects/:id/uploads',
    requires: { kind: 'permission', permission: 'upload.create' },
    success: 201,
    call: async () => {
      const { body, type } = multipart('matrix photo.png', png(2, 2), 'image/png');
      return { method: 'post', url: `/api/projects/${projectId}/uploads`, body, type };
    },
  },
  {
    route: 'GET /api/uploads/:id/content',
    requires: { kind: 'permission', permission: 'project.read' },
    success: 200,
    call: async (actor) => ({ method: 'get', url: `/api/uploads/${await freshUpload(actor)}/content` }),
  },
  {
    route: 'DELETE /api/uploads/:id',
    requires: { kind: 'permission', permission: 'upload.delete' },
    success: 204,
    call: async (actor) => ({ method: 'delete', url: `/api/uploads/${await freshUpload(actor)}` }),
  },
  {
    route: 'GET /api/teams/:teamId/library',
    requires: { kind: 'permission', permission: 'project.read' },
    success: 200,
    call: async () => ({ method: 'get', url: `/api/teams/${teamId}/library` }),
  },
  {
    route: 'POST /api/teams/:teamId/library',
    requires: { kind: 'permission', permission: 'project.edit' },
    success: 201,
    call: async () => ({ method: 'post', url: `/api/teams/${teamId}/library`, body: { ...matrixFuse, name: unique('Matrix fuse ') } }),
  },
  {
    route: 'PATCH /api/teams/:teamId/library/:itemId',
    requires: { kind: 'permission', permission: 'project.edit' },
    success: 200,
    call: async () => ({ method: 'patch', url: `/api/teams/${teamId}/library/${await freshLibraryItem()}`, body: { partNumber: 'MX-1' } }),
  },
  {
    route: 'DELETE /api/teams/:teamId/library/:itemId',
    requires: { kind: 'permission', permission: 'project.edit' },
    success: 204,
    call: async () => ({ method: 'delete', url: `/api/teams/${teamId}/library/${await freshLibraryItem()}` }),
  },
  {
    route: 'POST /api/teams/:teamId/library/import',
    requires: { kind: 'permission', permission: 'project.edit' },
    success: 200,
    call: async () => ({ method: 'post', url: `/api/teams/${teamId}/library/import`, body: { csv: `kind,name,conductor\ncable,${unique('Matrix cable ')},2 AWG\n`, mode: 'all_or_nothing' } }),
  },
  {
    route: 'GET /api/teams/:teamId/library/export',
    requires: { kind: 'permission', permission: 'project.read' },
    success: 200,
    call: async () => ({ method: 'get', url: `/api/teams/${teamId}/library/export` }),
  },
];

const agents = new Map<Actor, Agent>();

async function signedInAgent(actor: Actor): Promise<Agent> {
  return actor === 'anon' ? t.agent() : t.signIn(emailOf(actor), passwordOf(actor));
}

let dataDir: string;

beforeAll(async () => {
  dataDir = fs.mkdtempSync(path.join(os.tmpdir(), 'bw-matrix-'));
  t = await makeTestApp({ config: { dataDir } });
  placeholderHash = await hashPassword('matrix placeholder');
  const owner = await t.agentFor('owner');
  teamId = (await owner.get('/api/teams')).body.teams[0].id;
  projectId = (await owner.get(`/api/projects?teamId=${teamId}`)).body.projects[0].id;
  for (const u of await t.db.select({ id: users.id, email: users.email }).from(users)) userIds[u.email.split('@')[0]] = u.id;
  diagramId = await freshDiagram();
  // The outsider owns a team of their own, so "member of another team" is a real member.
  const outsider = t.agent();
  expect((await outsider.post('/api/auth/sign-up').send({ email: OUTSIDER_EMAIL, password: OUTSIDER_PASSWORD, name: 'Outsider' })).status).toBe(201);
  expect((await outsider.post('/api/teams').send({ name: 'Elsewhere Electrical' })).status).toBe(201);
  for (const actor of ACTORS) agents.set(actor, actor === 'outsider' ? outsider : actor === 'anon' ? t.agent() : await t.agentFor(actor));
});
afterAll(async () => {
  await t?.close();
  fs.rmSync(dataDir, { recursive: true, force: true });
});

describe('authorization matrix', () => {
  it('lists all 65 routes (add each new route here)', () => {
    expect(ROUTES.map((r) => r.route)).toHaveLength(65);
  });

  for (const c of ROUTES) {
    describe(c.route, () => {
      for (const actor of ACTORS) {
        const status = expected(c, actor);
        it(`${actor} -> ${status}`, async () => {
          const agent = c.freshSession ? await signedInAgent(actor) : agents.get(actor)!;
          const { method, url, body, type } = await c.call(actor, agent);
          const req = type ? agent[method](url).set('Content-Type', type) : agent[method](url);
          const res = body === undefined ? await req : await req.send(body as object);
          expect({ route: c.route, actor, status: res.status, body: res.status >= 400 ? res.body : undefined }).toMatchObject({ route: c.route, actor, status });
          if (status >= 400) expect(res.body.error.code).toBe({ 401: 'unauthenticated', 403: 'forbidden', 404: 'not_found' }[status]);
        });
      }
    });
  }
});

describe('the shared agents still work after the matrix', () => {
  it('every demo account is still signed in with its demo role', async () => {
    for (const role of ROLES) {
      const res = await agents.get(role)!.get(`/api/teams/${teamId}`);
      expect(res.status).toBe(200);
      expect(res.body.team.role).toBe(role);
    }
  });
});
