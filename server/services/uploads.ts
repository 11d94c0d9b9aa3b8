/**
 * Project uploads: data sheets and site photos. The bytes go to the storage adapter under a fresh
 * random key first, then the row and its activity entry are written in one transaction; if that fails
 * the stored bytes are removed again, so a refused request stores nothing.
 *
 * Who may do what (docs/api.md "Uploads"): every member reads and downloads; owners, designers and
 * trainers upload (trainers bring site photos for briefings — the `diagram.annotate` permission);
 * the uploader (while still allowed to upload) or an owner or designer (`project.edit`) deletes.
 */
import { desc, eq } from 'drizzle-orm';
import { can, type Permission, type Role } from '../../shared/roles';
import type { UploadRecord } from '../../shared/schemas/uploads';
import type { Db, DbOrTx } from '../db/client';
import { activity, uploads, users } from '../db/schema';
import { forbidden } from './errors';
import { newId } from '../ids';
import { newStorageKey, type UploadStorage } from '../storage';
import type { UploadRow } from './access';
import { sanitizeFileName, sniffUpload } from './upload-checks';
import { reserveQuota, type UploadQuotaConfig } from './upload-limits';
import { errorSummary, log } from '../http/logger';

/** The permission to upload (owners, designers, trainers). */
export const UPLOAD_PERMISSION: Permission = 'diagram.annotate';
/** The permission to delete anyone's upload (owners, designers). */
export const DELETE_ANY_UPLOAD_PERMISSION: Permission = 'project.edit';

export function mayDeleteUpload(role: Role, userId: string, upload: Pick<UploadRow, 'uploadedBy'>): boolean {
  return can(role, DELETE_ANY_UPLOAD_PERMISSION) || (upload.uploadedBy === userId && can(role, UPLOAD_PERMISSION));
}

const columns = {
  id: uploads.id,
  projectId: uploads.projectId,
  fileName: uploads.fileName,
  contentType: uploads.contentType,
  size: uploads.size,
  width: uploads.width,
  height: uploads.height,
  createdAt: uploads.createdAt,
  uploaderId: users.id,
  uploaderName: users.name,
};

function selectUploads(db: DbOrTx) {
  return db.select(columns).from(uploads).leftJoin(users, eq(users.id, uploads.uploadedBy));
}

type Selected = Awaited<ReturnType<typeof selectUploads>>[number];

function publicUpload(row: Selected): UploadRecord {
  const { uploaderId, uploaderName, createdAt, ...rest } = row;
  return {
    ...rest,
    contentType: rest.contentType as UploadRecord['contentType'],
    createdAt: createdAt.toISOString(),
    uploadedBy: uploaderId && uploaderName !== null ? { id: uploaderId, name: uploaderName } : null,
    contentUrl: `/api/uploads/${encodeURIComponent(rest.id)}/content`,
  };
}

export async function listUploads(db: DbOrTx, projectId: string): Promise<UploadRecord[]> {
  const rows = await selectUploads(db)
    .where(eq(uploads.projectId, projectId))
    .orderBy(desc(uploads.createdAt), desc(uploads.id));
  return rows.map(publicUpload);
}

async function getUpload(db: DbOrTx, id: string): Promise<UploadRecord> {
  const [row] = await selectUploads(db).where(eq(uploads.id, id));
  return publicUpload(row!);
}

export async function createUpload(
  db: Db,
  storage: UploadStorage,
  userId: string,
  projectId: string,
  file: { originalName: string; bytes: Uint8Array },
  /** The project's team and its storage quota, checked with the team's row locked (server/services/upload-limits.ts). */
  quota?: { teamId: string; limits: UploadQuotaConfig },
): Promise<UploadRecord> {
  const sniffed = await sniffUpload(file.bytes);
  const fileName = sanitizeFileName(file.originalName, sniffed.ext);
  const id = newId();
  const key = newStorageKey();
  await storage.put(key, file.bytes, sniffed.contentType);
  try {
    await db.transaction(async (tx) => {
      if (quota) await reserveQuota(tx, quota.limits, quota.teamId, file.bytes.byteLength);
      await tx.insert(uploads).values({
        id,
        projectId,
        key,
        fileName,
        contentType: sniffed.contentType,
        size: file.bytes.byteLength,
        width: sniffed.width,
        height: sniffed.height,
        uploadedBy: userId,
      });
      await tx.insert(activity).values({ id: newId(), projectId, userId, action: 'upload.added', detail: { uploadId: id, fileName, contentType: sniffed.contentType, size: file.bytes.byteLength } });
    });
  } catch (err) {
    await storage.delete(key).catch(() => {});
    throw err;
  }
  return getUpload(db, id);
}

export async function deleteUpload(db: Db, storage: UploadStorage, userId: string, role: Role, upload: UploadRow): Promise<void> {
  if (!mayDeleteUpload(role, userId, upload)) throw forbidden('Only the person who attached this file, a designer or an owner can delete it.');
  await db.transaction(async (tx) => {
    await tx.delete(uploads).where(eq(uploads.id, upload.id));
    await tx.insert(activity).values({ id: newId(), projectId: upload.projectId, userId, action: 'upload.deleted', detail: { uploadId: upload.id, fileName: upload.fileName } });
  });
  await removeStored(storage, [upload.key]);
}

/** Remove stored bytes after their rows are gone; a failure leaves an orphan (logged), never a row without bytes. */
export async function removeStored(storage: UploadStorage, keys: readonly string[]): Promise<void> {
  for (const key of keys) {
    try {
      await storage.delete(key);
    } catch (err) {
      log().error({ key, err: errorSummary(err) }, 'uploads: could not remove a stored file (left as an orphan)');
    }
  }
}

/** Storage keys of a project's (or a team's projects') uploads, read before a cascading delete. */
export async function uploadKeysOfProject(db: DbOrTx, projectId: string): Promise<string[]> {
  return (await db.select({ key: uploads.key }).from(uploads).where(eq(uploads.projectId, projectId))).map((r) => r.key);
}
