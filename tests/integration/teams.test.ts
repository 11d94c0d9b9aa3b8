import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { and, count, eq } from 'drizzle-orm';
import { invites, mailOutbox, memberships, teams } from '../../server/db/schema';
import { makeTestApp, type Agent, type TestApp } from '../helpers/app';

let t: TestApp;
let owner: Agent;
let demoTeamId: string;

beforeAll(async () => {
  t = await makeTestApp();
  owner = await t.agentFor('owner');
  demoTeamId = (await owner.get('/api/teams')).body.teams[0].id;
});
afterAll(async () => {
  await t?.close();
});

async function signUp(email: string, name = 'Test Person'): Promise<Agent> {
  const a = t.agent();
  const res = await a.post('/api/auth/sign-up').send({ email, password: 'correct horse battery', name });
  expect(res.status).toBe(201);
  return a;
}

/** Invites `email` with `role` into the team and returns the token from the captured e-mail. */
async function inviteAndReadToken(by: Agent, teamId: string, email: string, role: string): Promise<string> {
  const res = await by.post(`/api/teams/${teamId}/invites`).send({ email, role });
  expect(res.status).toBe(201);
  const outbox = await by.get(`/api/teams/${teamId}/outbox`);
  const mail = outbox.body.messages.find((m: { to: string }) => m.to === email);
  const token = /\/invites\/([A-Za-z0-9_-]+)/.exec(mail.text)![1];
  return token;
}

describe('teams', () => {
  it('lists the demo team with role and member count', async () => {
    const res = await owner.get('/api/teams');
    expect(res.status).toBe(200);
    expect(res.body.teams).toEqual([{ id: demoTeamId, name: 'Kestrel Bay Energy Works', role: 'owner', unitSystem: 'metric', memberCount: 5 }]);
  });

  it('creates a team with its creator as owner, reads, renames and deletes it', async () => {
    const a = await signUp('harbour.lead@example.test');
    const created = await a.post('/api/teams').send({ name: 'Harbour Crew', unitSystem: 'us' });
    expect(created.status).toBe(201);
    expect(created.body.team).toEqual({ id: expect.any(String), name: 'Harbour Crew', role: 'owner', unitSystem: 'us' });
    const id = created.body.team.id;

    const read = await a.get(`/api/teams/${id}`);
    expect(read.body.team).toEqual({ id, name: 'Harbour Crew', role: 'owner', unitSystem: 'us', memberCount: 1 });

    const patched = await a.patch(`/api/teams/${id}`).send({ name: 'Harbour Crew North', unitSystem: 'metric' });
    expect(patched.status).toBe(200);
    expect(patched.body.team).toMatchObject({ name: 'Harbour Crew North', unitSystem: 'metric' });

    const del = await a.delete(`/api/teams/${id}`);
    expect(del.status).toBe(204);
    expect((await a.get(`/api/teams/${id}`)).status).toBe(404);
    const [{ n }] = await t.db.select({ n: count() }).from(teams).where(eq(teams.id, id));
    expect(n).toBe(0);
  });

  it('validates team input', async () => {
    const res = await owner.post('/api/teams').send({ name: 'X', unitSystem: 'imperial' });
    expect(res.status).toBe(400);
    expect(res.body.error.details.fields).toEqual({
      name: ['Team name must be at least 2 characters'],
      unitSystem: [expect.any(String)],
    });
  });

  it('answers 404 for a team the user is not in, and 403 for a member without team.manage', async () => {
    const outsider = await signUp('outsider@example.test');
    expect((await outsider.get(`/api/teams/${demoTeamId}`)).status).toBe(404);
    expect((await outsider.get(`/api/teams/${demoTeamId}/members`)).status).toBe(404);
    const viewer = await t.agentFor('viewer');
    const res = await viewer.patch(`/api/teams/${demoTeamId}`).send({ name: 'Renamed by viewer' });
    expect(res.status).toBe(403);
    expect(res.body.error.code).toBe('forbidden');
    const [row] = await t.db.select().from(teams).where(eq(teams.id, demoTeamId));
    expect(row.name).toBe('Kestrel Bay Energy Works');
  });
});

describe('members', () => {
  it('lists members for every role; invites only for owners', async () => {
    await owner.post(`/api/teams/${demoTeamId}/invites`).send({ email: 'pending.person@example.test', role: 'viewer' });
    const asOwner = await owner.get(`/api/teams/${demoTeamId}/members`);
    expect(asOwner.status).toBe(200);
    expect(asOwner.body.members).toHaveLength(5);
    expect(asOwner.body.members[0]).toEqual({ userId: expect.any(String), email: expect.any(String), name: expect.any(String), role: expect.any(String), joinedAt: expect.any(String) });
    expect(asOwner.body.invites.map((i: { email: string }) => i.email)).toContain('pending.person@example.test');
    const asReviewer = await (await t.agentFor('reviewer')).get(`/api/teams/${demoTeamId}/members`);
    expect(asReviewer.status).toBe(200);
    expect(asReviewer.body.members).toHaveLength(5);
    expect(asReviewer.body.invites).toEqual([]);
  });
});

describe('invites', () => {
  it('sends an e-mail with an APP_ORIGIN link captured in the outbox; the invitee accepts with a matching e-mail', async () => {
    const res = await owner.post(`/api/teams/${demoTeamId}/invites`).send({ email: 'Wiremu.Fonoti@Example.TEST', role: 'designer' });
    expect(res.status).toBe(201);
    expect(res.body.invite).toEqual({ id: expect.any(String), email: 'wiremu.fonoti@example.test', role: 'designer', createdAt: expect.any(String), expiresAt: expect.any(String) });
    expect(JSON.stringify(res.body)).not.toMatch(/token/i);

    const outbox = await owner.get(`/api/teams/${demoTeamId}/outbox`);
    expect(outbox.status).toBe(200);
    const mail = outbox.body.messages.find((m: { to: string }) => m.to === 'wiremu.fonoti@example.test');
    expect(mail.subject).toBe('Maren Okafor invited you to Kestrel Bay Energy Works on Bankwright');
    const link = /http:\/\/bankwright\.test\/invites\/([A-Za-z0-9_-]{40,})/.exec(mail.text);
    expect(link).not.toBeNull();
    expect(mail.html).toContain(link![0]);
    const token = link![1];
    // The token is stored only as a hash.
    const [stored] = await t.db.select().from(invites).where(eq(invites.id, res.body.invite.id));
    expect(stored.tokenHash).not.toContain(token);
    expect(stored.tokenHash).toMatch(/^[0-9a-f]{64}$/);

    // Someone else signed in may view the invite but not accept it.
    const stranger = await signUp('stranger@example.test');
    const view = await stranger.get(`/api/invites/${token}`);
    expect(view.status).toBe(200);
    expect(view.body.invite).toEqual({ teamName: 'Kestrel Bay Energy Works', role: 'designer', email: 'wiremu.fonoti@example.test', expiresAt: expect.any(String) });
    const wrong = await stranger.post('/api/invites/accept').send({ token });
    expect(wrong.status).toBe(403);
    expect(wrong.body.error.code).toBe('forbidden');
    expect((await stranger.get(`/api/teams/${demoTeamId}`)).status).toBe(404);

    const invitee = await signUp('wiremu.fonoti@example.test', 'Wiremu Fonoti');
    const accepted = await invitee.post('/api/invites/accept').send({ token });
    expect(accepted.status).toBe(200);
    expect(accepted.body.team).toEqual({ id: demoTeamId, name: 'Kestrel Bay Energy Works', role: 'designer', unitSystem: 'metric' });
    expect((await invitee.get('/api/auth/me')).body.teams.map((x: { role: string }) => x.role)).toEqual(['designer']);

    // Used: gone.
    expect((await invitee.get(`/api/invites/${token}`)).status).toBe(404);
    expect((await invitee.post('/api/invites/accept').send({ token })).status).toBe(404);
  });

  it('answers 404 for an unknown token and 401 when signed out', async () => {
    const a = await t.agentFor('viewer');
    expect((await a.get('/api/invites/unknown-token-value-123')).status).toBe(404);
    expect((await t.agent().get('/api/invites/unknown-token-value-123')).status).toBe(401);
  });

  it('refuses to invite an existing member with 409 already_member, storing no invite and no mail', async () => {
    const [mailsBefore] = await t.db.select({ n: count() }).from(mailOutbox);
    const [invitesBefore] = await t.db.select({ n: count() }).from(invites);
    const res = await owner.post(`/api/teams/${demoTeamId}/invites`).send({ email: 'viewer@demo.test', role: 'designer' });
    expect(res.status).toBe(409);
    expect(res.body.error.code).toBe('already_member');
    expect((await t.db.select({ n: count() }).from(mailOutbox))[0].n).toBe(mailsBefore.n);
    expect((await t.db.select({ n: count() }).from(invites))[0].n).toBe(invitesBefore.n);
  });

  it('revokes an invite; the link then answers 404', async () => {
    const token = await inviteAndReadToken(owner, demoTeamId, 'revoked.person@example.test', 'viewer');
    const list = await owner.get(`/api/teams/${demoTeamId}/members`);
    const invite = list.body.invites.find((i: { email: string }) => i.email === 'revoked.person@example.test');
    expect((await owner.delete(`/api/teams/${demoTeamId}/invites/${invite.id}`)).status).toBe(204);
    expect((await owner.delete(`/api/teams/${demoTeamId}/invites/${invite.id}`)).status).toBe(404);
    const person = await signUp('revoked.person@example.test');
    expect((await person.get(`/api/invites/${token}`)).status).toBe(404);
  });

  it('a rejected invite (validation) stores nothing', async () => {
    const [before] = await t.db.select({ n: count() }).from(invites);
    const res = await owner.post(`/api/teams/${demoTeamId}/invites`).send({ email: 'someone@example.test', role: 'admiral' });
    expect(res.status).toBe(400);
    expect(res.body.error.details.fields.role).toBeDefined();
    const [after] = await t.db.select({ n: count() }).from(invites);
    expect(after.n).toBe(before.n);
  });
});

describe('roles and removal', () => {
  async function teamWithMember() {
    const boss = await signUp(`boss.${Math.random().toString(36).slice(2)}@example.test`, 'Boss');
    const teamId = (await boss.post('/api/teams').send({ name: 'Cable Yard', unitSystem: 'metric' })).body.team.id;
    const email = `crew.${Math.random().toString(36).slice(2)}@example.test`;
    const token = await inviteAndReadToken(boss, teamId, email, 'viewer');
    const crew = await signUp(email, 'Crew Member');
    expect((await crew.post('/api/invites/accept').send({ token })).status).toBe(200);
    const members = (await boss.get(`/api/teams/${teamId}/members`)).body.members as { userId: string; email: string }[];
    return { boss, crew, teamId, bossId: members.find((m) => m.email !== email)!.userId, crewId: members.find((m) => m.email === email)!.userId };
  }

  it('changes a member\'s role', async () => {
    const { boss, crew, teamId, crewId } = await teamWithMember();
    const res = await boss.patch(`/api/teams/${teamId}/members/${crewId}`).send({ role: 'reviewer' });
    expect(res.status).toBe(200);
    expect(res.body.member).toMatchObject({ userId: crewId, role: 'reviewer' });
    expect((await crew.get(`/api/teams/${teamId}`)).body.team.role).toBe('reviewer');
  });

  it('refuses to demote or remove the last owner with 409 last_owner, changing nothing', async () => {
    const { boss, teamId, bossId, crewId } = await teamWithMember();
    const demote = await boss.patch(`/api/teams/${teamId}/members/${bossId}`).send({ role: 'designer' });
    expect(demote.status).toBe(409);
    expect(demote.body.error.code).toBe('last_owner');
    const leave = await boss.delete(`/api/teams/${teamId}/members/${bossId}`);
    expect(leave.status).toBe(409);
    expect(leave.body.error.code).toBe('last_owner');
    const [row] = await t.db.select().from(memberships).where(and(eq(memberships.teamId, teamId), eq(memberships.userId, bossId)));
    expect(row.role).toBe('owner');
    // With a second owner, the first may step down.
    expect((await boss.patch(`/api/teams/${teamId}/members/${crewId}`).send({ role: 'owner' })).status).toBe(200);
    expect((await boss.patch(`/api/teams/${teamId}/members/${bossId}`).send({ role: 'designer' })).status).toBe(200);
  });

  it('removes a member; the removed user then gets 404 for the team', async () => {
    const { boss, crew, teamId, crewId } = await teamWithMember();
    expect((await boss.delete(`/api/teams/${teamId}/members/${crewId}`)).status).toBe(204);
    expect((await crew.get(`/api/teams/${teamId}`)).status).toBe(404);
    expect((await boss.delete(`/api/teams/${teamId}/members/${crewId}`)).status).toBe(404);
  });

  it('lets a member leave by removing themself, but not remove others', async () => {
    const { crew, teamId, crewId, bossId } = await teamWithMember();
    const kick = await crew.delete(`/api/teams/${teamId}/members/${bossId}`);
    expect(kick.status).toBe(403);
    expect((await crew.delete(`/api/teams/${teamId}/members/${crewId}`)).status).toBe(204);
    expect((await crew.get(`/api/teams/${teamId}`)).status).toBe(404);
  });

  it('answers 404 for a member of another team', async () => {
    const a = await teamWithMember();
    const b = await teamWithMember();
    const res = await a.boss.patch(`/api/teams/${a.teamId}/members/${b.crewId}`).send({ role: 'owner' });
    expect(res.status).toBe(404);
  });
});

describe('outbox', () => {
  it('is for owners only, and absent (404) when mail goes by SMTP', async () => {
    expect((await (await t.agentFor('designer')).get(`/api/teams/${demoTeamId}/outbox`)).status).toBe(403);
    const smtp = await makeTestApp({
      mailer: { mode: 'smtp', async sendMail() {}, async close() {} },
    });
    try {
      const o = await smtp.agentFor('owner');
      const id = (await o.get('/api/teams')).body.teams[0].id;
      const res = await o.get(`/api/teams/${id}/outbox`);
      expect(res.status).toBe(404);
      expect((await o.get('/api/auth/me')).body.mailMode).toBe('smtp');
    } finally {
      await smtp.close();
    }
  });

  it('a failed invite e-mail leaves no invite behind (502 mail_failed)', async () => {
    const broken = await makeTestApp({
      mailer: { mode: 'smtp', async sendMail() { throw new Error('connection refused'); }, async close() {} },
    });
    try {
      const o = await broken.agentFor('owner');
      const id = (await o.get('/api/teams')).body.teams[0].id;
      const res = await o.post(`/api/teams/${id}/invites`).send({ email: 'lost@example.test', role: 'viewer' });
      expect(res.status).toBe(502);
      expect(res.body.error.code).toBe('mail_failed');
      const [{ n }] = await broken.db.select({ n: count() }).from(invites);
      expect(n).toBe(0);
    } finally {
      await broken.close();
    }
  });
});
