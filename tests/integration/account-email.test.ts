/** PATCH /api/account/email (docs/api.md "Account"): a new sign-in address, confirmed with the current password. */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { eq } from 'drizzle-orm';
import { users } from '../../server/db/schema';
import { makeTestApp, type Agent, type TestApp } from '../helpers/app';

let t: TestApp;
beforeAll(async () => {
  t = await makeTestApp({ seed: false });
});
afterAll(async () => {
  await t?.close();
});

let n = 0;
async function newAccount(password = 'email password 1'): Promise<{ a: Agent; email: string; id: string }> {
  const email = `mail${++n}@example.test`;
  const a = t.agent();
  const res = await a.post('/api/auth/sign-up').send({ email, password, name: `Mail ${n}` });
  expect(res.status).toBe(201);
  return { a, email, id: res.body.user.id };
}

describe('PATCH /api/account/email', () => {
  it('changes the e-mail (trimmed, lower-cased) and answers the user; the session and the other sessions go on', async () => {
    const { a, email, id } = await newAccount();
    const other = await t.signIn(email, 'email password 1');
    const res = await a.patch('/api/account/email').send({ email: '  Rigger.Lead@Harbour.Example ', currentPassword: 'email password 1' });
    expect(res.status).toBe(200);
    expect(res.body.user).toMatchObject({ id, email: 'rigger.lead@harbour.example' });
    expect(Object.keys(res.body.user).sort()).toEqual(['createdAt', 'email', 'id', 'name']);
    expect((await a.get('/api/auth/me')).body.user.email).toBe('rigger.lead@harbour.example');
    expect((await other.get('/api/auth/me')).body.user.email).toBe('rigger.lead@harbour.example');
    const [row] = await t.db.select({ email: users.email }).from(users).where(eq(users.id, id));
    expect(row.email).toBe('rigger.lead@harbour.example');
  });

  it('a wrong current password is 401 invalid_credentials and changes nothing', async () => {
    const { a, email, id } = await newAccount();
    const res = await a.patch('/api/account/email').send({ email: 'elsewhere@example.test', currentPassword: 'not my password' });
    expect(res.status).toBe(401);
    expect(res.body.error.code).toBe('invalid_credentials');
    const [row] = await t.db.select({ email: users.email }).from(users).where(eq(users.id, id));
    expect(row.email).toBe(email);
  });

  it("another account's address is 409 email_taken with the field; my own address is accepted unchanged", async () => {
    const first = await newAccount();
    const second = await newAccount();
    const taken = await second.a.patch('/api/account/email').send({ email: first.email, currentPassword: 'email password 1' });
    expect(taken.status).toBe(409);
    expect(taken.body.error.code).toBe('email_taken');
    expect(taken.body.error.details.fields.email).toHaveLength(1);
    const same = await first.a.patch('/api/account/email').send({ email: first.email.toUpperCase(), currentPassword: 'email password 1' });
    expect(same.status).toBe(200);
    expect(same.body.user.email).toBe(first.email);
  });

  it('refuses a malformed address with 400 naming email, and answers 401 when signed out', async () => {
    const { a } = await newAccount();
    const bad = await a.patch('/api/account/email').send({ email: 'not an address', currentPassword: 'email password 1' });
    expect(bad.status).toBe(400);
    expect(Object.keys(bad.body.error.details.fields)).toEqual(['email']);
    const anon = await t.agent().patch('/api/account/email').send({ email: 'x@example.test', currentPassword: 'whatever' });
    expect(anon.status).toBe(401);
  });
});
