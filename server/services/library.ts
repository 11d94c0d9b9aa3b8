/**
 * The team parts library: presets of batteries, cables, fuses and busbars shared by a team
 * (shared/library). Every write is validated with libraryItemSchema. CSV import is row by row
 * (parseLibraryCsv): "all_or_nothing" imports nothing when any row fails; "valid_rows" imports the rows
 * that pass and reports the others. A row whose `id` names an item of this team updates it; any other
 * row creates an item (ids from another team's export are not this team's, so they create).
 */
import { and, asc, count, eq, inArray } from 'drizzle-orm';
import { alias } from 'drizzle-orm/pg-core';
import { libraryItemSchema, parseLibraryCsv, type LibraryItem } from '../../shared/library';
import { LIBRARY_MAX_ITEMS, type ImportMode, type ImportResult, type LibraryRecord, type UpdateLibraryItemInput } from '../../shared/schemas/library';
import type { Db, DbOrTx } from '../db/client';
import { libraryItems, users } from '../db/schema';
import { notFound, unprocessable, validationFailed } from './errors';
import { newId } from '../ids';

const updater = alias(users, 'library_updater');

function selectItems(db: DbOrTx) {
  return db
    .select({ item: libraryItems, updaterId: updater.id, updaterName: updater.name })
    .from(libraryItems)
    .leftJoin(updater, eq(updater.id, libraryItems.updatedBy));
}

type Selected = Awaited<ReturnType<typeof selectItems>>[number];

function publicItem({ item, updaterId, updaterName }: Selected): LibraryRecord {
  return {
    id: item.id,
    teamId: item.teamId,
    kind: item.kind,
    name: item.name,
    manufacturer: item.manufacturer,
    partNumber: item.partNumber,
    props: item.props,
    createdAt: item.createdAt.toISOString(),
    updatedAt: item.updatedAt.toISOString(),
    updatedBy: updaterId && updaterName !== null ? { id: updaterId, name: updaterName } : null,
  } as LibraryRecord;
}

const KIND_ORDER = { battery: 0, cable: 1, fuse: 2, busbar: 3 } as const;

export async function listLibrary(db: DbOrTx, teamId: string): Promise<LibraryRecord[]> {
  const rows = await selectItems(db).where(eq(libraryItems.teamId, teamId)).orderBy(asc(libraryItems.name), asc(libraryItems.id));
  return rows.map(publicItem).sort((a, b) => KIND_ORDER[a.kind] - KIND_ORDER[b.kind]);
}

async function getItem(db: DbOrTx, teamId: string, itemId: string): Promise<LibraryRecord> {
  const [row] = await selectItems(db).where(and(eq(libraryItems.teamId, teamId), eq(libraryItems.id, itemId)));
  if (!row) throw notFound('No such library item.');
  return publicItem(row);
}

function columnsOf(item: LibraryItem) {
  return { kind: item.kind, name: item.name, manufacturer: item.manufacturer ?? '', partNumber: item.partNumber ?? '', props: item.props };
}

async function assertRoom(tx: DbOrTx, teamId: string, adding: number) {
  if (adding <= 0) return;
  const [{ n }] = await tx.select({ n: count() }).from(libraryItems).where(eq(libraryItems.teamId, teamId));
  if (n + adding > LIBRARY_MAX_ITEMS) {
    throw unprocessable('library_full', `A team library holds at most ${LIBRARY_MAX_ITEMS} items; it has ${n}, and this would add ${adding}.`, { limit: LIBRARY_MAX_ITEMS, count: n });
  }
}

export async function createLibraryItem(db: Db, userId: string, teamId: string, item: LibraryItem): Promise<LibraryRecord> {
  const id = newId();
  await db.transaction(async (tx) => {
    await assertRoom(tx, teamId, 1);
    await tx.insert(libraryItems).values({ id, teamId, ...columnsOf(item), createdBy: userId, updatedBy: userId });
  });
  return getItem(db, teamId, id);
}

export async function updateLibraryItem(db: Db, userId: string, teamId: string, itemId: string, patch: UpdateLibraryItemInput): Promise<LibraryRecord> {
  await db.transaction(async (tx) => {
    const [row] = await tx.select().from(libraryItems).where(and(eq(libraryItems.teamId, teamId), eq(libraryItems.id, itemId))).for('update');
    if (!row) throw notFound('No such library item.');
    const merged = libraryItemSchema.safeParse({
      kind: row.kind,
      name: patch.name ?? row.name,
      manufacturer: patch.manufacturer ?? row.manufacturer,
      partNumber: patch.partNumber ?? row.partNumber,
      props: patch.props ?? row.props,
    });
    if (!merged.success) throw validationFailed(merged.error);
    await tx
      .update(libraryItems)
      .set({ ...columnsOf(merged.data), updatedBy: userId, updatedAt: new Date() })
      .where(eq(libraryItems.id, itemId));
  });
  return getItem(db, teamId, itemId);
}

export async function deleteLibraryItem(db: Db, teamId: string, itemId: string): Promise<void> {
  const gone = await db.delete(libraryItems).where(and(eq(libraryItems.teamId, teamId), eq(libraryItems.id, itemId))).returning({ id: libraryItems.id });
  if (!gone.length) throw notFound('No such library item.');
}

export async function importLibraryCsv(db: Db, userId: string, teamId: string, csv: string, mode: ImportMode): Promise<ImportResult> {
  const parsed = parseLibraryCsv(csv);
  const rows = parsed.ok ? [] : parsed.rows;
  const items = parsed.ok ? parsed.items : parsed.validItems;
  const headerBroken = rows.some((r) => r.row === 0);
  if (rows.length && (mode === 'all_or_nothing' || headerBroken || items.length === 0)) {
    throw unprocessable(
      'import_failed',
      headerBroken
        ? 'The header row cannot be read, so nothing was imported.'
        : mode === 'all_or_nothing'
          ? `${rows.length} ${rows.length === 1 ? 'row has' : 'rows have'} errors, so nothing was imported. Fix them, or import the valid rows only.`
          : 'No row could be imported.',
      { rows, validCount: headerBroken ? 0 : items.length },
    );
  }
  let created = 0;
  let updated = 0;
  await db.transaction(async (tx) => {
    const ids = items.map((i) => i.id).filter((id): id is string => id !== undefined);
    const existing = new Set(
      ids.length
        ? (await tx.select({ id: libraryItems.id }).from(libraryItems).where(and(eq(libraryItems.teamId, teamId), inArray(libraryItems.id, ids))).for('update')).map((r) => r.id)
        : [],
    );
    const toCreate = items.filter((i) => !(i.id && existing.has(i.id)));
    await assertRoom(tx, teamId, toCreate.length);
    const now = new Date();
    for (const item of items) {
      if (item.id && existing.has(item.id)) {
        await tx.update(libraryItems).set({ ...columnsOf(item), updatedBy: userId, updatedAt: now }).where(eq(libraryItems.id, item.id));
        updated++;
      }
    }
    if (toCreate.length) {
      await tx.insert(libraryItems).values(toCreate.map((item) => ({ id: newId(), teamId, ...columnsOf(item), createdBy: userId, updatedBy: userId })));
      created = toCreate.length;
    }
  });
  return { imported: created + updated, created, updated, rows };
}
