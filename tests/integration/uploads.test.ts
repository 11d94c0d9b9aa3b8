/**
 * Project uploads: data sheets and site photos. Types are sniffed from the bytes, never the name;
 * executables, archives, markup, decompression bombs, oversize files and path-traversal names are
 * refused or neutralised; roles decide who uploads, downloads and deletes. Also the storage adapters
 * (local disk; S3 with a fake client, no network).
 */
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { Readable } from 'node:stream';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import { eq } from 'drizzle-orm';
import { DeleteObjectCommand, GetObjectCommand, PutObjectCommand } from '@aws-sdk/client-s3';
import { activity, uploads } from '../../server/db/schema';
import { loadConfig } from '../../server/config';
import { sanitizeFileName } from '../../server/services/upload-checks';
import { createStorage, LocalDiskStorage, newStorageKey, S3Storage, StorageNotFoundError } from '../../server/storage';
import { makeTestApp, type Agent, type TestApp } from '../helpers/app';
import { elf, gzippedPdf, html, jpeg, multipart, mz, officeZip, pdf, png, svg, webp, zip } from './upload-fixtures';

const MAX_BYTES = 256 * 1024;
let t: TestApp;
let dataDir: string;
let uploadsRoot: string;
let projectId: string;

beforeAll(async () => {
  dataDir = fs.mkdtempSync(path.join(os.tmpdir(), 'bw-uploads-'));
  uploadsRoot = path.join(dataDir, 'uploads');
  t = await makeTestApp({ config: { dataDir, uploadMaxBytes: MAX_BYTES } });
  const owner = await t.agentFor('owner');
  const teamId = (await owner.get('/api/teams')).body.teams[0].id;
  projectId = (await owner.get(`/api/projects?teamId=${teamId}`)).body.projects[0].id;
});
afterAll(async () => {
  await t?.close();
  fs.rmSync(dataDir, { recursive: true, force: true });
});

function send(agent: Agent, fileName: string, bytes: Buffer, contentType?: string, project = projectId) {
  const { body, type } = multipart(fileName, bytes, contentType);
  return agent.post(`/api/projects/${project}/uploads`).set('Content-Type', type).send(body);
}

/** Every file under the storage root (relative paths). */
function storedFiles(): string[] {
  if (!fs.existsSync(uploadsRoot)) return [];
  return (fs.readdirSync(uploadsRoot, { recursive: true }) as string[]).filter((p) => fs.statSync(path.join(uploadsRoot, p)).isFile()).sort();
}

async function rowCount() {
  return (await t.db.select({ id: uploads.id }).from(uploads)).length;
}

describe('accepted files', () => {
  it('stores a PDF data sheet, lists it with who and when, and serves it as an attachment', async () => {
    const designer = await t.agentFor('designer');
    const bytes = pdf('Class T fuse holder');
    const res = await send(designer, 'fuse-holder datasheet.pdf', bytes, 'application/pdf');
    expect(res.status).toBe(201);
    expect(res.body.upload).toMatchObject({
      projectId,
      fileName: 'fuse-holder datasheet.pdf',
      contentType: 'application/pdf',
      size: bytes.length,
      width: null,
      height: null,
      uploadedBy: { name: 'Tomasz Ilunga' },
    });
    const id = res.body.upload.id;

    const list = await (await t.agentFor('viewer')).get(`/api/projects/${projectId}/uploads`);
    expect(list.status).toBe(200);
    expect(list.body.maxBytes).toBe(MAX_BYTES);
    const listed = list.body.uploads.find((u: { id: string }) => u.id === id);
    expect(listed.uploadedBy.name).toBe('Tomasz Ilunga');
    expect(Date.now() - Date.parse(listed.createdAt)).toBeLessThan(10 * 60_000);

    const got = await (await t.agentFor('viewer')).get(listed.contentUrl).buffer(true).parse((r, cb) => {
      const chunks: Buffer[] = [];
      r.on('data', (c: Buffer) => chunks.push(c));
      r.on('end', () => cb(null, Buffer.concat(chunks)));
    });
    expect(got.status).toBe(200);
    expect(Buffer.compare(got.body as Buffer, bytes)).toBe(0);
    expect(got.headers['content-type']).toBe('application/pdf');
    expect(got.headers['content-disposition']).toMatch(/^attachment; filename="fuse-holder datasheet.pdf"/);
    expect(got.headers['x-content-type-options']).toBe('nosniff');
    expect(got.headers['content-security-policy']).toMatch(/sandbox/);
    expect(got.headers['content-security-policy']).toMatch(/default-src 'none'/);

    const rows = await t.db.select().from(activity).where(eq(activity.projectId, projectId));
    expect(rows.find((r) => r.action === 'upload.added' && (r.detail as { uploadId?: string }).uploadId === id)).toBeTruthy();
  });

  it.each([
    ['battery-box.png', png(4, 3), 'image/png', 4, 3],
    ['battery-box.jpg', jpeg(640, 480), 'image/jpeg', 640, 480],
    ['battery-box.webp', webp(300, 200), 'image/webp', 300, 200],
  ])('stores the photo %s with its dimensions and serves it inline', async (name, bytes, type, width, height) => {
    const trainer = await t.agentFor('trainer');
    const res = await send(trainer, name, bytes, type);
    expect(res.status).toBe(201);
    expect(res.body.upload).toMatchObject({ fileName: name, contentType: type, width, height, uploadedBy: { name: 'Sione Valdés' } });
    const got = await trainer.get(res.body.upload.contentUrl);
    expect(got.status).toBe(200);
    expect(got.headers['content-type']).toBe(type);
    expect(got.headers['content-disposition']).toMatch(/^inline; /);
    expect(got.headers['x-content-type-options']).toBe('nosniff');
  });

  it('takes the type from the bytes, not the name or the claimed Content-Type: a PNG sent as "scan.pdf" is stored as a PNG', async () => {
    const res = await send(await t.agentFor('designer'), 'scan.pdf', png(2, 2), 'application/pdf');
    expect(res.status).toBe(201);
    expect(res.body.upload.contentType).toBe('image/png');
    expect(res.body.upload.fileName).toBe('scan.pdf.png');
  });
});

describe('refused files store nothing', () => {
  async function expectRefused(res: { status: number; body: { error: { code: string; message: string; details?: { detected?: string } } } }, status: number, code: string) {
    expect(res.status).toBe(status);
    expect(res.body.error.code).toBe(code);
    return res.body.error;
  }

  it.each([
    ['an ELF executable named photo.jpg', 'photo.jpg', elf(), 'image/jpeg', 'application/x-elf (.elf)'],
    ['a Windows executable named datasheet.pdf', 'datasheet.pdf', mz(), 'application/pdf', 'application/x-msdownload (.exe)'],
    ['a ZIP archive named site.png', 'site.png', zip(), 'image/png', 'application/zip (.zip)'],
    ['a gzip stream named sheet.pdf', 'sheet.pdf', gzippedPdf(), 'application/pdf', 'application/gzip (.gz)'],
    ['an SVG with a script named diagram.png', 'diagram.png', svg(), 'image/svg+xml', 'SVG markup'],
    ['an HTML page named sheet.pdf', 'sheet.pdf', html(), 'text/html', 'HTML'],
  ])('refuses %s with 415 naming what it is', async (_what, name, bytes, claimed, detected) => {
    const before = { files: storedFiles(), rows: await rowCount() };
    const err = await expectRefused(await send(await t.agentFor('designer'), name, bytes, claimed), 415, 'unsupported_type');
    expect(err.details!.detected).toBe(detected);
    expect(err.message).toContain(detected);
    expect({ files: storedFiles(), rows: await rowCount() }).toEqual(before);
  });

  it('never decompresses anything: archives are refused from their magic bytes, unopened', async () => {
    const made = vi.fn();
    const Original = globalThis.DecompressionStream;
    vi.stubGlobal(
      'DecompressionStream',
      class extends Original {
        constructor(format: CompressionFormat) {
          made(format);
          super(format);
        }
      },
    );
    try {
      await expectRefused(await send(await t.agentFor('designer'), 'spec.pdf', officeZip()), 415, 'unsupported_type');
      await expectRefused(await send(await t.agentFor('designer'), 'spec.pdf', gzippedPdf()), 415, 'unsupported_type');
    } finally {
      vi.unstubAllGlobals();
    }
    expect(made).not.toHaveBeenCalled();
  });

  it('refuses a PNG whose header claims 50000 × 50000 pixels (decompression-bomb guard) with 422', async () => {
    const before = storedFiles();
    const err = await expectRefused(await send(await t.agentFor('designer'), 'bomb.png', png(2, 2, { width: 50000, height: 50000 })), 422, 'image_too_large');
    expect(err.message).toContain('50000 × 50000');
    expect(storedFiles()).toEqual(before);
  });

  it('refuses a JPEG wider than 20000 pixels even when the megapixels are few', async () => {
    await expectRefused(await send(await t.agentFor('designer'), 'strip.jpg', jpeg(30000, 10)), 422, 'image_too_large');
  });

  it('refuses a file that starts like a PDF but is not a whole one', async () => {
    const truncated = pdf().subarray(0, 60);
    await expectRefused(await send(await t.agentFor('designer'), 'cut.pdf', truncated), 422, 'invalid_file');
  });

  it('refuses a file over the size limit with 413 and a message naming the limit', async () => {
    const before = { files: storedFiles(), rows: await rowCount() };
    const big = Buffer.concat([pdf(), Buffer.alloc(MAX_BYTES + 1, 0x20)]);
    const err = await expectRefused(await send(await t.agentFor('designer'), 'huge.pdf', big), 413, 'payload_too_large');
    expect(err.message).toContain('0.3 MB');
    expect((err as { details?: { limitBytes?: number } }).details?.limitBytes).toBe(MAX_BYTES);
    expect({ files: storedFiles(), rows: await rowCount() }).toEqual(before);
  });

  it('answers 400 without a file, with a file in another field, or with a JSON body', async () => {
    const designer = await t.agentFor('designer');
    const other = multipart('a.pdf', pdf(), 'application/pdf', 'attachment');
    expect((await designer.post(`/api/projects/${projectId}/uploads`).set('Content-Type', other.type).send(other.body)).status).toBe(400);
    const json = await designer.post(`/api/projects/${projectId}/uploads`).send({ file: 'JVBERi0=' });
    expect(json.status).toBe(400);
    expect(json.body.error.code).toBe('validation_failed');
    const empty = await send(designer, 'empty.pdf', Buffer.alloc(0));
    expect(empty.status).toBe(422);
  });
});

describe('file names', () => {
  it('stores "../../etc/passwd.pdf" as passwd.pdf under a random key, never outside the storage root', async () => {
    const res = await send(await t.agentFor('designer'), '../../etc/passwd.pdf', pdf());
    expect(res.status).toBe(201);
    expect(res.body.upload.fileName).toBe('passwd.pdf');
    const [row] = await t.db.select().from(uploads).where(eq(uploads.id, res.body.upload.id));
    expect(row.key).toMatch(/^[A-Za-z0-9_-]{32}$/);
    // Everything on disk is <root>/<2 chars>/<key>; nothing escaped next to the data dir.
    for (const f of storedFiles()) expect(f).toMatch(/^[A-Za-z0-9_-]{2}\/[A-Za-z0-9_-]{32}$/);
    expect(storedFiles()).toContain(`${row.key.slice(0, 2)}/${row.key}`);
    expect(fs.existsSync(path.join(dataDir, 'etc'))).toBe(false);
    expect(fs.existsSync(path.join(path.dirname(dataDir), 'etc', 'passwd.pdf'))).toBe(false);
    const got = await (await t.agentFor('viewer')).get(res.body.upload.contentUrl);
    expect(got.headers['content-disposition']).toMatch(/filename="passwd.pdf"/);
  });

  it.each([
    ['..\\..\\windows\\system.ini.pdf', 'pdf', 'system.ini.pdf'],
    ['.htaccess', 'pdf', 'htaccess.pdf'],
    ['...', 'png', 'file.png'],
    ['photo.exe', 'jpg', 'photo.exe.jpg'],
    ['IMG_0042.JPEG', 'jpg', 'IMG_0042.jpeg'],
    ['invoice\u202Egpj.pdf', 'pdf', 'invoicegpj.pdf'],
    ['line\r\nbreak\u0000.pdf', 'pdf', 'linebreak.pdf'],
    ['a<b>c:d"e|f?g*h.png', 'png', 'a_b_c_d_e_f_g_h.png'],
    ['CON.pdf', 'pdf', 'file-CON.pdf'],
    ['site..photo.webp', 'webp', 'site.photo.webp'],
    ['', 'pdf', 'file.pdf'],
  ])('sanitizes %j (%s) to %j', (raw, ext, expected) => {
    expect(sanitizeFileName(raw, ext)).toBe(expected);
  });

  it('keeps names to 120 characters, the sniffed extension included', () => {
    const name = sanitizeFileName(`${'ü'.repeat(300)}.pdf`, 'pdf');
    expect(Array.from(name)).toHaveLength(120);
    expect(name.endsWith('ü.pdf')).toBe(true);
  });

  it('keeps UTF-8 names as sent', async () => {
    const res = await send(await t.agentFor('designer'), 'Sammelschiene Übersicht.pdf', pdf());
    expect(res.status).toBe(201);
    expect(res.body.upload.fileName).toBe('Sammelschiene Übersicht.pdf');
    const got = await (await t.agentFor('designer')).get(res.body.upload.contentUrl);
    expect(got.headers['content-disposition']).toContain("filename*=UTF-8''Sammelschiene%20%C3%9Cbersicht.pdf");
  });
});

describe('roles', () => {
  it('lets owners, designers and trainers upload; reviewers and viewers get 403; another team 404; signed out 401', async () => {
    for (const role of ['owner', 'designer', 'trainer'] as const) expect((await send(await t.agentFor(role), `${role}.png`, png(2, 2))).status).toBe(201);
    for (const role of ['reviewer', 'viewer'] as const) expect((await send(await t.agentFor(role), `${role}.png`, png(2, 2))).status).toBe(403);
    const outsider = t.agent();
    await outsider.post('/api/auth/sign-up').send({ email: 'uploads-outsider@elsewhere.test', password: 'outsider password', name: 'Outsider' });
    expect((await send(outsider, 'x.png', png(2, 2))).status).toBe(404);
    expect((await send(t.agent(), 'x.png', png(2, 2))).status).toBe(401);
  });

  it('lets the uploader, designers and owners delete; not another trainer; and removes the stored bytes', async () => {
    const trainer = await t.agentFor('trainer');
    const designer = await t.agentFor('designer');
    const own = (await send(trainer, 'own.png', png(2, 2))).body.upload;
    const theirs = (await send(designer, 'theirs.pdf', pdf())).body.upload;
    const [ownRow] = await t.db.select().from(uploads).where(eq(uploads.id, own.id));

    expect((await (await t.agentFor('reviewer')).delete(`/api/uploads/${own.id}`)).status).toBe(403);
    const refused = await trainer.delete(`/api/uploads/${theirs.id}`);
    expect(refused.status).toBe(403);
    expect(refused.body.error.code).toBe('forbidden');

    expect((await trainer.delete(`/api/uploads/${own.id}`)).status).toBe(204);
    expect(storedFiles()).not.toContain(`${ownRow.key.slice(0, 2)}/${ownRow.key}`);
    expect((await trainer.get(own.contentUrl)).status).toBe(404);
    expect((await (await t.agentFor('owner')).delete(`/api/uploads/${theirs.id}`)).status).toBe(204);
    const deleted = await t.db.select().from(activity).where(eq(activity.action, 'upload.deleted'));
    expect(deleted.map((r) => (r.detail as { uploadId: string }).uploadId)).toEqual(expect.arrayContaining([own.id, theirs.id]));
  });

  it('removes the stored bytes of a deleted project', async () => {
    const owner = await t.agentFor('owner');
    const teamId = (await owner.get('/api/teams')).body.teams[0].id;
    const project = (await owner.post('/api/projects').send({ teamId, name: 'Short-lived project' })).body.project;
    const up = (await send(owner, 'gone.png', png(2, 2), 'image/png', project.id)).body.upload;
    const [row] = await t.db.select().from(uploads).where(eq(uploads.id, up.id));
    expect(storedFiles()).toContain(`${row.key.slice(0, 2)}/${row.key}`);
    expect((await owner.delete(`/api/projects/${project.id}`)).status).toBe(204);
    expect(storedFiles()).not.toContain(`${row.key.slice(0, 2)}/${row.key}`);
  });
});

describe('storage adapters', () => {
  it('local disk: put, get, delete; keys that could name a path are refused', async () => {
    const root = fs.mkdtempSync(path.join(os.tmpdir(), 'bw-store-'));
    try {
      const store = new LocalDiskStorage(root);
      const key = newStorageKey();
      await store.put(key, new Uint8Array([1, 2, 3]), 'application/pdf');
      const chunks: Buffer[] = [];
      for await (const c of await store.get(key)) chunks.push(c as Buffer);
      expect([...Buffer.concat(chunks)]).toEqual([1, 2, 3]);
      expect(fs.readdirSync(path.join(root, key.slice(0, 2)))).toEqual([key]); // no temporary file left
      await store.delete(key);
      await expect(store.get(key)).rejects.toBeInstanceOf(StorageNotFoundError);
      await store.delete(key); // deleting twice is fine
      for (const bad of ['../../etc/passwd', '..', 'a/b', '', `${key}/..`, `${key.slice(0, 31)}.`]) {
        await expect(store.put(bad, new Uint8Array([1]), 'application/pdf')).rejects.toThrow('Invalid storage key');
        await expect(store.get(bad)).rejects.toThrow('Invalid storage key');
      }
      const files = (fs.readdirSync(root, { recursive: true }) as string[]).filter((f) => fs.statSync(path.join(root, f)).isFile());
      expect(files).toEqual([]);
    } finally {
      fs.rmSync(root, { recursive: true, force: true });
    }
  });

  it('S3: sends Put/Get/Delete with the bucket, the prefixed key and the type (fake client, no network)', async () => {
    const sent: unknown[] = [];
    const body = Readable.from([Buffer.from('pdf bytes')]);
    const client = {
      async send(command: unknown) {
        sent.push(command);
        if (command instanceof GetObjectCommand) {
          if (command.input.Key === 'bw/uploads/missingmissingmissingmissingmiss') throw Object.assign(new Error('gone'), { name: 'NoSuchKey' });
          return { Body: body };
        }
        return {};
      },
    };
    const store = new S3Storage({ client, bucket: 'kestrel-files', prefix: '/bw/uploads/' });
    const key = newStorageKey();
    await store.put(key, new Uint8Array([9, 8]), 'image/png');
    expect(sent[0]).toBeInstanceOf(PutObjectCommand);
    expect((sent[0] as PutObjectCommand).input).toMatchObject({ Bucket: 'kestrel-files', Key: `bw/uploads/${key}`, ContentType: 'image/png', ContentLength: 2 });
    expect(await store.get(key)).toBe(body);
    expect((sent[1] as GetObjectCommand).input).toEqual({ Bucket: 'kestrel-files', Key: `bw/uploads/${key}` });
    await expect(store.get('missingmissingmissingmissingmiss')).rejects.toBeInstanceOf(StorageNotFoundError);
    await store.delete(key);
    expect(sent[3]).toBeInstanceOf(DeleteObjectCommand);
    expect((sent[3] as DeleteObjectCommand).input).toEqual({ Bucket: 'kestrel-files', Key: `bw/uploads/${key}` });
    await expect(store.put('../escape', new Uint8Array([1]), 'image/png')).rejects.toThrow('Invalid storage key');
    expect(sent).toHaveLength(4);
  });

  it('configuration: DATA_DIR/uploads by default, an S3 bucket when S3_BUCKET is set', () => {
    const local = createStorage(loadConfig({ NODE_ENV: 'test', DATA_DIR: '/srv/bankwright' }));
    expect(local).toBeInstanceOf(LocalDiskStorage);
    expect(local.location).toBe('/srv/bankwright/uploads');
    const config = loadConfig({ NODE_ENV: 'test', S3_BUCKET: 'kestrel-files', S3_ENDPOINT: 'http://127.0.0.1:9000', S3_PREFIX: 'bw' });
    expect(config.storage).toEqual({ kind: 's3', bucket: 'kestrel-files', endpoint: 'http://127.0.0.1:9000', region: 'us-east-1', prefix: 'bw', forcePathStyle: true });
    const s3 = createStorage(config);
    expect(s3).toBeInstanceOf(S3Storage);
    expect(s3.location).toBe('s3://kestrel-files/bw/');
    expect(loadConfig({ NODE_ENV: 'test' }).uploadMaxBytes).toBe(20 * 1024 * 1024);
    expect(() => loadConfig({ NODE_ENV: 'test', UPLOAD_MAX_MB: 'lots' })).toThrow(/UPLOAD_MAX_MB/);
    expect(() => loadConfig({ NODE_ENV: 'test', S3_BUCKET: 'Not A Bucket' })).toThrow(/S3_BUCKET/);
  });
});

describe('team storage quota and per-user upload rate', () => {
  /** A PDF of exactly `size` bytes. */
  const pdfOf = (size: number) => {
    const bytes = pdf('x'.repeat(size - pdf('').length));
    expect(bytes.length).toBe(size);
    return bytes;
  };

  describe('storage quota per team (1,000 bytes here)', () => {
    let q: TestApp;
    let qDir: string;
    let ownTeamProject: string;
    let otherTeamProject: string;
    const files = () => (fs.existsSync(path.join(qDir, 'uploads')) ? (fs.readdirSync(path.join(qDir, 'uploads'), { recursive: true }) as string[]).filter((p) => fs.statSync(path.join(qDir, 'uploads', p)).isFile()).length : 0);

    beforeAll(async () => {
      qDir = fs.mkdtempSync(path.join(os.tmpdir(), 'bw-quota-'));
      q = await makeTestApp({ config: { dataDir: qDir, uploadQuota: { teamBytes: 1000, ratePerUser: 1000, rateWindowSeconds: 600 } } });
      const owner = await q.agentFor('owner');
      const teamId = (await owner.get('/api/teams')).body.teams[0].id;
      ownTeamProject = (await owner.post('/api/projects').send({ teamId, name: 'Quota project' })).body.project.id;
      const otherTeam = (await owner.post('/api/teams').send({ name: 'Second quota team' })).body.team.id;
      otherTeamProject = (await owner.post('/api/projects').send({ teamId: otherTeam, name: 'Other team project' })).body.project.id;
    });
    afterAll(async () => {
      await q?.close();
      fs.rmSync(qDir, { recursive: true, force: true });
    });

    it('refuses a file that would take the team over its quota with 413 quota_exceeded, naming the limit and what to do; stores nothing', async () => {
      const owner = await q.agentFor('owner');
      expect((await send(owner, 'first.pdf', pdfOf(600), 'application/pdf', ownTeamProject)).status).toBe(201);
      const rowsBefore = (await q.db.select({ id: uploads.id }).from(uploads)).length;
      const filesBefore = files();
      const res = await send(owner, 'second.pdf', pdfOf(600), 'application/pdf', ownTeamProject);
      expect(res.status).toBe(413);
      expect(res.body.error.code).toBe('quota_exceeded');
      expect(res.body.error.message).toBe(
        "This 600 bytes file does not fit in your team's 1000 bytes storage quota (600 bytes already used). Delete files the team no longer needs, or ask the server's administrator to raise UPLOAD_TEAM_QUOTA_MB.",
      );
      expect(res.body.error.details).toEqual({ quotaBytes: 1000, usedBytes: 600, fileBytes: 600 });
      expect((await q.db.select({ id: uploads.id }).from(uploads)).length).toBe(rowsBefore);
      expect(files()).toBe(filesBefore);
      // The quota is the team's: another team of the same person has its own.
      expect((await send(owner, 'elsewhere.pdf', pdfOf(600), 'application/pdf', otherTeamProject)).status).toBe(201);
    });

    it('fills up to the quota exactly, then refuses before reading the body; deleting a file makes room again', async () => {
      const owner = await q.agentFor('owner');
      const fits = await send(owner, 'exact.pdf', pdfOf(400), 'application/pdf', ownTeamProject);
      expect(fits.status).toBe(201);
      const full = await send(owner, 'small.pdf', pdfOf(pdf('').length), 'application/pdf', ownTeamProject);
      expect(full.status).toBe(413);
      expect(full.body.error.code).toBe('quota_exceeded');
      expect(full.body.error.message).toContain('use 1000 bytes of its 1000 bytes storage quota');
      expect(full.body.error.details).toEqual({ quotaBytes: 1000, usedBytes: 1000 });
      expect((await owner.delete(`/api/uploads/${fits.body.upload.id}`)).status).toBe(204);
      expect((await send(owner, 'again.pdf', pdfOf(400), 'application/pdf', ownTeamProject)).status).toBe(201);
    });

    it('two uploads at the same moment cannot both squeeze under the quota', async () => {
      const owner = await q.agentFor('owner');
      const teamId = (await owner.post('/api/teams').send({ name: 'Race quota team' })).body.team.id;
      const project = (await owner.post('/api/projects').send({ teamId, name: 'Race project' })).body.project.id;
      const results = await Promise.all([send(owner, 'a.pdf', pdfOf(600), 'application/pdf', project), send(owner, 'b.pdf', pdfOf(600), 'application/pdf', project)]);
      expect(results.map((r) => r.status).sort()).toEqual([201, 413]);
      expect((await owner.get(`/api/projects/${project}/uploads`)).body.uploads).toHaveLength(1);
    });
  });

  describe('upload rate per person (3 per 10 minutes here)', () => {
    let r: TestApp;
    let rDir: string;
    let project: string;
    beforeAll(async () => {
      rDir = fs.mkdtempSync(path.join(os.tmpdir(), 'bw-rate-'));
      r = await makeTestApp({ config: { dataDir: rDir, uploadQuota: { teamBytes: 1024 ** 3, ratePerUser: 3, rateWindowSeconds: 600 } } });
      const owner = await r.agentFor('owner');
      const teamId = (await owner.get('/api/teams')).body.teams[0].id;
      project = (await owner.get(`/api/projects?teamId=${teamId}`)).body.projects[0].id;
    });
    afterAll(async () => {
      await r?.close();
      fs.rmSync(rDir, { recursive: true, force: true });
    });

    it('answers 429 too_many_uploads with Retry-After after the limit, per person; refused uploads count too', async () => {
      const designer = await r.agentFor('designer');
      expect((await send(designer, 'one.pdf', pdf('one'), 'application/pdf', project)).status).toBe(201);
      expect((await send(designer, 'page.html', html(), 'text/html', project)).status).toBe(415);
      expect((await send(designer, 'three.pdf', pdf('three'), 'application/pdf', project)).status).toBe(201);
      const rowsBefore = (await r.db.select({ id: uploads.id }).from(uploads)).length;
      const res = await send(designer, 'four.pdf', pdf('four'), 'application/pdf', project);
      expect(res.status).toBe(429);
      expect(res.body.error.code).toBe('too_many_uploads');
      expect(res.body.error.message).toBe('You have started 3 uploads in the last 10 minutes, the most allowed. Wait 10 minutes and try again; an administrator can raise UPLOAD_RATE_MAX.');
      const retryAfter = Number(res.headers['retry-after']);
      expect(retryAfter).toBeGreaterThan(590);
      expect(retryAfter).toBeLessThanOrEqual(600);
      expect(res.body.error.details).toEqual({ limit: 3, windowSeconds: 600, retryAfterSeconds: retryAfter });
      expect((await r.db.select({ id: uploads.id }).from(uploads)).length).toBe(rowsBefore);
      // Another person on the same team is not held back.
      expect((await send(await r.agentFor('owner'), 'owners.pdf', pdf('owner'), 'application/pdf', project)).status).toBe(201);
    });
  });

  it('configuration: UPLOAD_TEAM_QUOTA_MB, UPLOAD_RATE_MAX and UPLOAD_RATE_MINUTES, with defaults of 2 GB and 30 per 10 minutes', () => {
    expect(loadConfig({ NODE_ENV: 'test' }).uploadQuota).toEqual({ teamBytes: 2 * 1024 ** 3, ratePerUser: 30, rateWindowSeconds: 600 });
    expect(loadConfig({ NODE_ENV: 'test', UPLOAD_TEAM_QUOTA_MB: '500', UPLOAD_RATE_MAX: '5', UPLOAD_RATE_MINUTES: '60' }).uploadQuota).toEqual({ teamBytes: 500 * 1024 ** 2, ratePerUser: 5, rateWindowSeconds: 3600 });
    expect(() => loadConfig({ NODE_ENV: 'test', UPLOAD_TEAM_QUOTA_MB: '0' })).toThrow(/UPLOAD_TEAM_QUOTA_MB/);
    expect(() => loadConfig({ NODE_ENV: 'test', UPLOAD_RATE_MAX: 'many' })).toThrow(/UPLOAD_RATE_MAX/);
  });
});
