/**
 * Uploads on local disk, under DATA_DIR/uploads by default: `<root>/<first two key characters>/<key>`.
 * Paths are built only from server-made keys (assertStorageKey), so no user input ever reaches a path.
 * A file is written to a temporary name, flushed and renamed, so a crash never leaves half a file under
 * a key.
 */
import fsp from 'node:fs/promises';
import path from 'node:path';
import type { Readable } from 'node:stream';
import { randomBytes } from 'node:crypto';
import { assertStorageKey, StorageNotFoundError, type UploadStorage } from './types';

export class LocalDiskStorage implements UploadStorage {
  readonly kind = 'local' as const;
  readonly root: string;

  constructor(root: string) {
    this.root = path.resolve(root);
  }

  get location(): string {
    return this.root;
  }

  /** The file of a key, checked to lie inside the root. */
  pathOf(key: string): string {
    assertStorageKey(key);
    const file = path.join(this.root, key.slice(0, 2), key);
    if (path.relative(this.root, file).startsWith('..')) throw new Error('Invalid storage key');
    return file;
  }

  async put(key: string, bytes: Uint8Array, _contentType: string): Promise<void> {
    const file = this.pathOf(key);
    await fsp.mkdir(path.dirname(file), { recursive: true, mode: 0o700 });
    const tmp = `${file}.${randomBytes(6).toString('hex')}.tmp`;
    const handle = await fsp.open(tmp, 'wx', 0o600);
    try {
      await handle.writeFile(bytes);
      await handle.sync();
    } finally {
      await handle.close();
    }
    try {
      await fsp.rename(tmp, file);
    } catch (err) {
      await fsp.rm(tmp, { force: true });
      throw err;
    }
  }

  async get(key: string): Promise<Readable> {
    const file = this.pathOf(key);
    // Open first, so a missing file is a StorageNotFoundError here and not a stream error later.
    let handle: fsp.FileHandle;
    try {
      handle = await fsp.open(file, 'r');
    } catch (err) {
      if ((err as NodeJS.ErrnoException).code === 'ENOENT') throw new StorageNotFoundError(key);
      throw err;
    }
    return handle.createReadStream({ autoClose: true });
  }

  async delete(key: string): Promise<void> {
    await fsp.rm(this.pathOf(key), { force: true });
  }
}
