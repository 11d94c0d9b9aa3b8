/**
 * The team parts library: list, add, edit, delete, CSV import in both modes with the row-by-row report,
 * CSV export that reads back, roles, and another team's library answering 404.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { eq } from 'drizzle-orm';
import { parseLibraryCsv } from '../../shared/library';
import { libraryItems } from '../../server/db/schema';
import { makeTestApp, type TestApp } from '../helpers/app';

let t: TestApp;
let teamId: string;

beforeAll(async () => {
  t = await makeTestApp();
  teamId = (await (await t.agentFor('owner')).get('/api/teams')).body.teams[0].id;
});
afterAll(async () => {
  await t?.close();
});

const fuse = { kind: 'fuse', name: 'Class T 400 A', manufacturer: 'Breakwater Protection', partNumber: 'BW-T400', props: { fuseClass: 'class_t', rating_A: 400, voltage_rating_V: 160, interrupting_A: 20000 } };

const HEADER = 'kind,name,chemistry,nominal_V,capacity_Ah,r_internal_ohm,conductor,fuseClass,rating_A,voltage_rating_V,interrupting_A';
const GOOD_BATTERY = 'battery,Import LFP 280 Ah,lfp,12.8,280,0.002,,,,,';
const GOOD_CABLE = 'cable,Import flex 1/0,,,,,1/0 AWG,,,,';
const BAD_COMMA = 'battery,Bad comma battery,lfp,"12,8",100,0.004,,,,,';
const BAD_CABLE = 'cable,Bare number cable,,,,,35,,,,';

async function names(): Promise<string[]> {
  return (await t.db.select({ name: libraryItems.name }).from(libraryItems).where(eq(libraryItems.teamId, teamId))).map((r) => r.name);
}

describe('items', () => {
  it('lists the demo presets to every member, grouped battery, cable, fuse, busbar', async () => {
    const res = await (await t.agentFor('viewer')).get(`/api/teams/${teamId}/library`);
    expect(res.status).toBe(200);
    const kinds = res.body.items.map((i: { kind: string }) => i.kind);
    expect(kinds.length).toBe(9);
    expect(kinds).toEqual([...kinds].sort((a: string, b: string) => ['battery', 'cable', 'fuse', 'busbar'].indexOf(a) - ['battery', 'cable', 'fuse', 'busbar'].indexOf(b)));
    expect(new Set(kinds)).toEqual(new Set(['battery', 'cable', 'fuse', 'busbar']));
  });

  it('adds, edits and deletes an item (designer); the server assigns the id', async () => {
    const designer = await t.agentFor('designer');
    const created = await designer.post(`/api/teams/${teamId}/library`).send({ ...fuse, id: 'chosen-by-client' });
    expect(created.status).toBe(201);
    const item = created.body.item;
    expect(item).toMatchObject({ ...fuse, teamId, updatedBy: { name: 'Tomasz Ilunga' } });
    expect(item.id).not.toBe('chosen-by-client');

    const edited = await designer.patch(`/api/teams/${teamId}/library/${item.id}`).send({ name: 'Class T 400 A (spare)', props: { ...fuse.props, rating_A: 350 } });
    expect(edited.status).toBe(200);
    expect(edited.body.item).toMatchObject({ name: 'Class T 400 A (spare)', kind: 'fuse', props: { rating_A: 350 } });

    expect((await designer.delete(`/api/teams/${teamId}/library/${item.id}`)).status).toBe(204);
    expect((await designer.delete(`/api/teams/${teamId}/library/${item.id}`)).status).toBe(404);
  });

  it('validates with the library schema: bad props, wrong kind, props of another kind on edit', async () => {
    const designer = await t.agentFor('designer');
    const bad = await designer.post(`/api/teams/${teamId}/library`).send({ ...fuse, props: { ...fuse.props, rating_A: -5 } });
    expect(bad.status).toBe(400);
    expect(Object.keys(bad.body.error.details.fields)).toContain('props.rating_A');
    expect((await designer.post(`/api/teams/${teamId}/library`).send({ ...fuse, kind: 'inverter' })).status).toBe(400);

    const item = (await designer.post(`/api/teams/${teamId}/library`).send(fuse)).body.item;
    // A cable's props on a fuse: refused, the item unchanged.
    const wrong = await designer.patch(`/api/teams/${teamId}/library/${item.id}`).send({ props: { conductor: { system: 'awg', gauge: '2/0' } } });
    expect(wrong.status).toBe(400);
    expect((await designer.patch(`/api/teams/${teamId}/library/${item.id}`).send({ kind: 'cable' })).status).toBe(400);
    expect((await designer.patch(`/api/teams/${teamId}/library/${item.id}`).send({})).status).toBe(400);
    const [row] = await t.db.select().from(libraryItems).where(eq(libraryItems.id, item.id));
    expect(row.props).toEqual(fuse.props);
  });

  it('lets owners and designers write; reviewers, trainers and viewers get 403; another team 404', async () => {
    for (const role of ['reviewer', 'trainer', 'viewer'] as const) {
      const a = await t.agentFor(role);
      expect((await a.post(`/api/teams/${teamId}/library`).send(fuse)).status).toBe(403);
      expect((await a.post(`/api/teams/${teamId}/library/import`).send({ csv: `${HEADER}\n${GOOD_BATTERY}` })).status).toBe(403);
    }
    const item = (await (await t.agentFor('owner')).post(`/api/teams/${teamId}/library`).send(fuse)).body.item;
    const outsider = t.agent();
    await outsider.post('/api/auth/sign-up').send({ email: 'library-outsider@elsewhere.test', password: 'outsider password', name: 'Outsider' });
    const own = (await outsider.post('/api/teams').send({ name: 'Elsewhere' })).body.team;
    expect((await outsider.get(`/api/teams/${teamId}/library`)).status).toBe(404);
    expect((await outsider.get(`/api/teams/${teamId}/library/export`)).status).toBe(404);
    // An item id of another team, through the outsider's own team: no such item there.
    expect((await outsider.patch(`/api/teams/${own.id}/library/${item.id}`).send({ name: 'Taken over' })).status).toBe(404);
    expect((await outsider.delete(`/api/teams/${own.id}/library/${item.id}`)).status).toBe(404);
  });
});

describe('CSV import', () => {
  it('all_or_nothing with a bad row imports nothing and answers 422 with the row-by-row report', async () => {
    const before = await names();
    const csv = [HEADER, GOOD_BATTERY, BAD_COMMA, GOOD_CABLE, BAD_CABLE].join('\n');
    const res = await (await t.agentFor('designer')).post(`/api/teams/${teamId}/library/import`).send({ csv, mode: 'all_or_nothing' });
    expect(res.status).toBe(422);
    expect(res.body.error.code).toBe('import_failed');
    expect(res.body.error.details.validCount).toBe(2);
    const rows = res.body.error.details.rows;
    expect(rows.map((r: { row: number; line: number }) => [r.row, r.line])).toEqual([[2, 3], [4, 5]]);
    expect(rows[0].errors).toEqual([expect.objectContaining({ column: 'nominal_V', message: expect.stringContaining('decimal point') })]);
    expect(rows[1].errors[0].column).toBe('conductor');
    expect(await names()).toEqual(before);
  });

  it('the mode defaults to all_or_nothing', async () => {
    const res = await (await t.agentFor('designer')).post(`/api/teams/${teamId}/library/import`).send({ csv: [HEADER, GOOD_BATTERY, BAD_COMMA].join('\n') });
    expect(res.status).toBe(422);
  });

  it('valid_rows imports the rows that pass and reports the others', async () => {
    const before = await names();
    const csv = [HEADER, GOOD_BATTERY, BAD_COMMA, GOOD_CABLE, BAD_CABLE].join('\r\n');
    const res = await (await t.agentFor('owner')).post(`/api/teams/${teamId}/library/import`).send({ csv, mode: 'valid_rows' });
    expect(res.status).toBe(200);
    expect(res.body).toMatchObject({ imported: 2, created: 2, updated: 0 });
    expect(res.body.rows.map((r: { row: number }) => r.row)).toEqual([2, 4]);
    expect((await names()).sort()).toEqual([...before, 'Import LFP 280 Ah', 'Import flex 1/0'].sort());
  });

  it('a clean file imports whole in all_or_nothing', async () => {
    const res = await (await t.agentFor('designer')).post(`/api/teams/${teamId}/library/import`).send({ csv: `${HEADER}\nfuse,Import ANL 150,,,,,,anl,150,32,6000\n`, mode: 'all_or_nothing' });
    expect(res.status).toBe(200);
    expect(res.body).toEqual({ imported: 1, created: 1, updated: 0, rows: [] });
  });

  it('a broken header imports nothing in either mode', async () => {
    for (const mode of ['all_or_nothing', 'valid_rows']) {
      const res = await (await t.agentFor('designer')).post(`/api/teams/${teamId}/library/import`).send({ csv: `kind,name,wattage\n${GOOD_CABLE}`, mode });
      expect(res.status).toBe(422);
      expect(res.body.error.details.rows[0]).toMatchObject({ row: 0, errors: [expect.objectContaining({ column: 'wattage' })] });
    }
  });

  it('refuses an unknown mode and an empty file with 400', async () => {
    const designer = await t.agentFor('designer');
    expect((await designer.post(`/api/teams/${teamId}/library/import`).send({ csv: `${HEADER}\n${GOOD_CABLE}`, mode: 'some' })).status).toBe(400);
    expect((await designer.post(`/api/teams/${teamId}/library/import`).send({ csv: '' })).status).toBe(400);
  });
});

describe('CSV export', () => {
  it('exports every item as CSV that reads back to the same items; re-importing it updates, never duplicates', async () => {
    const designer = await t.agentFor('designer');
    const res = await designer.get(`/api/teams/${teamId}/library/export`);
    expect(res.status).toBe(200);
    expect(res.headers['content-type']).toBe('text/csv; charset=utf-8');
    expect(res.headers['content-disposition']).toBe('attachment; filename="kestrel-bay-energy-works-parts-library.csv"');
    const parsed = parseLibraryCsv(res.text);
    expect(parsed.ok).toBe(true);
    const listed = (await designer.get(`/api/teams/${teamId}/library`)).body.items;
    if (!parsed.ok) return;
    expect(parsed.items).toHaveLength(listed.length);
    const byId = new Map(listed.map((i: { id: string }) => [i.id, i]));
    for (const item of parsed.items) {
      const stored = byId.get(item.id!) as { name: string; kind: string; props: unknown };
      expect({ name: item.name, kind: item.kind, props: item.props }).toEqual({ name: stored.name, kind: stored.kind, props: stored.props });
    }

    const count = listed.length;
    const again = await designer.post(`/api/teams/${teamId}/library/import`).send({ csv: res.text });
    expect(again.status).toBe(200);
    expect(again.body).toMatchObject({ imported: count, created: 0, updated: count });
    expect((await designer.get(`/api/teams/${teamId}/library`)).body.items).toHaveLength(count);
  });

  it('guards text cells against spreadsheet formulas', async () => {
    const designer = await t.agentFor('designer');
    await designer.post(`/api/teams/${teamId}/library`).send({ ...fuse, name: '=HYPERLINK("http://x.test")' });
    const csv = (await designer.get(`/api/teams/${teamId}/library/export`)).text;
    expect(csv).toContain(`"'=HYPERLINK(""http://x.test"")"`);
  });
});
