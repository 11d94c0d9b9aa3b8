/**
 * Attack: cross-site request forgery. A page on another site makes the victim's browser send a mutation
 * with the victim's session cookie: a plain HTML form (text/plain or urlencoded, no preflight), a
 * fetch from a sibling subdomain, a sandboxed iframe (Origin: null), or a look-alike origin. Every such
 * request is refused with 403 origin_rejected and stores nothing.
 * The basic cases (foreign Origin on POST /api/teams, no Origin with a cookie, login CSRF) are in
 * tests/integration/auth.test.ts ("origin check").
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { count, eq } from 'drizzle-orm';
import { projects, teams } from '../../server/db/schema';
import { makeTestApp, DEMO_PASSWORD, TEST_ORIGIN, type TestApp } from '../helpers/app';

let t: TestApp;
let cookie: string;
let teamId: string;
let projectId: string;

beforeAll(async () => {
  t = await makeTestApp();
  const signIn = await t.agent().post('/api/auth/sign-in').send({ email: 'owner@demo.test', password: DEMO_PASSWORD });
  cookie = (signIn.headers['set-cookie'] as unknown as string[]).find((c) => c.startsWith('bw_session='))!.split(';')[0];
  const owner = await t.agentFor('owner');
  teamId = (await owner.get('/api/teams')).body.teams[0].id;
  projectId = (await owner.get(`/api/projects?teamId=${teamId}`)).body.projects[0].id;
});
afterAll(async () => {
  await t?.close();
});

const teamCount = async () => (await t.db.select({ n: count() }).from(teams))[0].n;

function expectRefused(res: request.Response) {
  expect(res.status).toBe(403);
  expect(res.body.error.code).toBe('origin_rejected');
}

describe('CSRF: cross-site form posts with the victim\'s cookie', () => {
  it('a text/plain form post crafted to look like JSON is refused and creates nothing', async () => {
    const before = await teamCount();
    // <form enctype="text/plain"> with an input named '{"name":"Forged","x":"' and value '"}'
    const res = await request(t.server)
      .post('/api/teams')
      .set('Cookie', cookie)
      .set('Origin', 'https://evil.example')
      .set('Sec-Fetch-Site', 'cross-site')
      .set('Content-Type', 'text/plain')
      .send('{"name":"Forged team","x":"="}');
    expectRefused(res);
    expect(await teamCount()).toBe(before);
  });

  it('an urlencoded form post is refused and changes nothing', async () => {
    const res = await request(t.server)
      .patch(`/api/projects/${projectId}`)
      .set('Cookie', cookie)
      .set('Origin', 'https://evil.example')
      .set('Content-Type', 'application/x-www-form-urlencoded')
      .send('name=Forged+name');
    expectRefused(res);
    const [row] = await t.db.select().from(projects).where(eq(projects.id, projectId));
    expect(row.name).not.toBe('Forged name');
  });

  it('a form post with no Origin but Sec-Fetch-Site: cross-site is refused', async () => {
    const res = await request(t.server).post('/api/teams').set('Cookie', cookie).set('Sec-Fetch-Site', 'cross-site').send({ name: 'Forged by fetch metadata' });
    expectRefused(res);
  });

  it('a sibling subdomain (Sec-Fetch-Site: same-site) is refused', async () => {
    const res = await request(t.server)
      .post('/api/teams')
      .set('Cookie', cookie)
      .set('Origin', 'http://blog.bankwright.test')
      .set('Sec-Fetch-Site', 'same-site')
      .send({ name: 'Forged from a sibling' });
    expectRefused(res);
  });

  it('Origin: null (sandboxed iframe, data: URL) is refused', async () => {
    const res = await request(t.server).post('/api/teams').set('Cookie', cookie).set('Origin', 'null').send({ name: 'Forged from null' });
    expectRefused(res);
  });

  it('look-alike origins are refused: a suffix, a prefix, another scheme, another port', async () => {
    for (const origin of [`${TEST_ORIGIN}.evil.example`, 'http://evilbankwright.test', TEST_ORIGIN.replace('http:', 'https:'), `${TEST_ORIGIN}:8080`, `${TEST_ORIGIN}/`]) {
      const res = await request(t.server).post('/api/teams').set('Cookie', cookie).set('Origin', origin).send({ name: `Forged ${origin}` });
      expect({ origin, status: res.status }).toEqual({ origin, status: 403 });
    }
  });

  it('DELETE and PUT are guarded like POST: the project and its diagram survive', async () => {
    const del = await request(t.server).delete(`/api/projects/${projectId}`).set('Cookie', cookie).set('Origin', 'https://evil.example');
    expectRefused(del);
    const diagrams = (await (await t.agentFor('owner')).get(`/api/projects/${projectId}/diagrams`)).body.diagrams as { id: string }[];
    const put = await request(t.server)
      .put(`/api/diagrams/${diagrams[0].id}/working-copy`)
      .set('Cookie', cookie)
      .set('Origin', 'https://evil.example')
      .send({ content: {}, baseVersion: 1 });
    expectRefused(put);
    expect((await t.db.select().from(projects).where(eq(projects.id, projectId))).length).toBe(1);
  });

  it('a forged sign-out cannot end the victim\'s session', async () => {
    const res = await request(t.server).post('/api/auth/sign-out').set('Cookie', cookie).set('Origin', 'https://evil.example');
    expectRefused(res);
    expect((await request(t.server).get('/api/auth/me').set('Cookie', cookie)).status).toBe(200);
  });

  it('the same request from the app itself passes (the guard is not refusing everything)', async () => {
    const res = await request(t.server).post('/api/teams').set('Cookie', cookie).set('Origin', TEST_ORIGIN).send({ name: 'Real team from the app' });
    expect(res.status).toBe(201);
  });
});
