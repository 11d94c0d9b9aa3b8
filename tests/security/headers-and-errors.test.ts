/**
 * Attacks through the browser and through error pages: clickjacking and script injection (security
 * headers on API answers and on the app's HTML), prototype pollution through JSON bodies, and
 * information leaks in errors (no stack trace, no SQL, no library names, even on a real server fault).
 * The CSP's script-src and x-powered-by on /api/health, malformed JSON and 413 on one route are in
 * tests/integration/auth.test.ts.
 */
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import http from 'node:http';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { createApp } from '../../server/app';
import { testConfig } from '../../server/config';
import { createOutboxMailer } from '../../server/mail/mailer';
import { seedDemo } from '../../server/db/demo-data';
import { createLogger } from '../../server/http/logger';
import { createTestDatabase, type TestDatabase } from '../helpers/db';
import { makeTestApp, DEMO_PASSWORD, TEST_ORIGIN, type TestApp } from '../helpers/app';

const LEAK = /\n\s+at |\bat .+\.(js|ts|mjs):\d+|node_modules|pglite|drizzle|postgres|syntax error at|SELECT |INSERT |relation "|Error:/i;

function directives(csp: string): Record<string, string[]> {
  return Object.fromEntries(csp.split(';').map((d) => d.trim()).filter(Boolean).map((d) => { const [k, ...v] = d.split(/\s+/); return [k, v]; }));
}

let t: TestApp;
beforeAll(async () => {
  t = await makeTestApp();
});
afterAll(async () => {
  await t?.close();
});

describe('security headers', () => {
  function expectHardened(res: request.Response) {
    const csp = directives(res.headers['content-security-policy']);
    expect(csp['script-src']).toEqual(["'self'"]); // only the app's own scripts: no inline, no eval, no other host
    expect(csp['default-src']).toEqual(["'self'"]);
    expect(csp['object-src']).toEqual(["'none'"]);
    expect(csp['frame-ancestors']).toEqual(["'none'"]); // clickjacking
    expect(csp['base-uri']).toEqual(["'self'"]);
    expect(csp['form-action']).toEqual(["'self'"]);
    expect(res.headers['x-frame-options']).toBeDefined();
    expect(res.headers['x-content-type-options']).toBe('nosniff');
    expect(res.headers['referrer-policy']).toBe('no-referrer');
    expect(res.headers['x-powered-by']).toBeUndefined();
  }

  it('every API answer carries them, errors included', async () => {
    const a = await t.agentFor('viewer');
    for (const res of [await a.get('/api/teams'), await a.get('/api/no-such-route'), await request(t.server).get('/api/auth/me'), await a.post('/api/teams').set('Content-Type', 'application/json').send('{')]) {
      expectHardened(res);
      expect(res.headers['cache-control']).toBe('no-store');
    }
  });

  it("the app's HTML carries them too (static client with the SPA fallback)", async () => {
    const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'bw-client-'));
    fs.mkdirSync(path.join(dir, 'assets'));
    fs.writeFileSync(path.join(dir, 'index.html'), '<!doctype html><script type="module" src="/assets/app.js"></script>');
    fs.writeFileSync(path.join(dir, 'assets', 'app.js'), 'console.log(1)');
    const app = createApp({ db: t.db, mailer: t.mailer, config: t.config, client: { mode: 'static', dir } });
    try {
      for (const url of ['/', '/teams/x/projects', '/assets/app.js']) {
        const res = await request(app).get(url);
        expect(res.status).toBe(200);
        expectHardened(res);
      }
      expect((await request(app).get('/assets/missing.js')).text).not.toMatch(LEAK);
    } finally {
      fs.rmSync(dir, { recursive: true, force: true });
    }
  });
});

describe('no leaks in error answers', () => {
  it('hostile requests answer 4xx with the error shape and nothing about the internals', async () => {
    const a = await t.agentFor('owner');
    const deep = '['.repeat(100_000) + ']'.repeat(100_000);
    const cases: [string, () => Promise<request.Response>][] = [
      ['malformed JSON on a project', () => a.patch('/api/projects/x').set('Content-Type', 'application/json').send('{"name":')],
      ['100,000 levels of nesting', () => a.post('/api/teams').set('Content-Type', 'application/json').send(deep)],
      ['a JSON string as the body', () => a.post('/api/teams').set('Content-Type', 'application/json').send('"just a string"')],
      ['an unsupported charset', () => a.post('/api/teams').set('Content-Type', 'application/json; charset=utf-7').send('{"name":"x"}')],
      ['a garbage gzip body', () => a.post('/api/teams').set('Content-Type', 'application/json').set('Content-Encoding', 'gzip').send('not gzip at all')],
      ['an unknown content encoding', () => a.post('/api/teams').set('Content-Type', 'application/json').set('Content-Encoding', 'rot13').send('{}')],
      ['a 10,000-character id', () => a.get(`/api/projects/${'x'.repeat(10_000)}`)],
      ['a path-traversal id', () => a.get('/api/projects/..%2F..%2Fetc%2Fpasswd')],
      ['an SQL-looking id', () => a.get(`/api/diagrams/${encodeURIComponent("1' or '1'='1")}`)],
      ['a repeated query parameter', () => a.get('/api/projects?teamId=a&teamId=b')],
      ['a bracketed query parameter', () => a.get('/api/projects?teamId[$ne]=x')],
      ['a revision number that is not one', () => a.get('/api/diagrams/x/revisions/1e9999')],
      ['a method the route lacks', () => a.put('/api/teams').send({})],
      ['a body over the limit', () => a.post('/api/teams').send({ name: 'x'.repeat(1_200_000) })],
    ];
    for (const [name, run] of cases) {
      const res = await run();
      const where = `${name}: ${res.status} ${res.text.slice(0, 200)}`;
      expect(res.status, where).toBeGreaterThanOrEqual(400);
      expect(res.status, where).toBeLessThan(500);
      expect(res.body?.error?.code, where).toMatch(/^[a-z_]+$/);
      expect(res.text, where).not.toMatch(LEAK);
    }
  });

  it('a JSON body cannot pollute prototypes', async () => {
    const a = await t.agentFor('owner');
    const res = await a.post('/api/teams').set('Content-Type', 'application/json').send('{"name":"Proto team","__proto__":{"polluted":"yes"},"constructor":{"prototype":{"polluted":"yes"}}}');
    expect(res.status).toBeLessThan(500);
    expect(({} as { polluted?: string }).polluted).toBeUndefined();
    expect(JSON.stringify(res.body)).not.toContain('polluted');
  });

  describe('a real server fault (the database gone)', () => {
    let database: TestDatabase;
    let server: http.Server;
    let cookie: string;
    const logged: { level: number; reqId: string; err?: { type?: string; frames?: string[] } }[] = [];
    beforeAll(async () => {
      database = await createTestDatabase();
      await seedDemo(database.db, DEMO_PASSWORD);
      const logger = createLogger('error', { write: (line: string) => void logged.push(JSON.parse(line)) });
      const app = createApp({ db: database.db, mailer: createOutboxMailer(database.db), config: testConfig({ appOrigin: TEST_ORIGIN }), logger });
      server = http.createServer(app);
      const signIn = await request(server).post('/api/auth/sign-in').set('Origin', TEST_ORIGIN).send({ email: 'owner@demo.test', password: DEMO_PASSWORD });
      cookie = (signIn.headers['set-cookie'] as unknown as string[])[0].split(';')[0];
      await database.close(); // every query now fails inside the database driver
    });
    afterAll(async () => {
      await database?.destroy();
    });

    it('answers 500 internal with a generic message, logs the cause on the server, and leaks nothing', async () => {
      for (const req of [request(server).get('/api/auth/me').set('Cookie', cookie), request(server).post('/api/auth/sign-in').set('Origin', TEST_ORIGIN).send({ email: 'owner@demo.test', password: DEMO_PASSWORD })]) {
        const res = await req;
        expect(res.status).toBe(500);
        expect(res.body).toEqual({ error: { code: 'internal', message: 'Something went wrong on the server. Try again.' } });
        expect(res.text).not.toMatch(LEAK);
        // The structured log has the fault under the request's id, with its code path (server/http/logger.ts).
        const line = logged.find((l) => l.reqId === res.headers['x-request-id']);
        expect(line?.level).toBe(50);
        expect(line?.err?.frames?.length).toBeGreaterThan(0);
      }
    });
  });
});
