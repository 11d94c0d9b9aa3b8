/** The storage adapter the configuration asks for: an S3-compatible bucket when S3_BUCKET is set, else DATA_DIR/uploads. */
import path from 'node:path';
import type { Config } from '../config';
import { LocalDiskStorage } from './local';
import { createS3Client, S3Storage } from './s3';
import type { UploadStorage } from './types';

export * from './types';
export { LocalDiskStorage } from './local';
export { S3Storage } from './s3';

export function createStorage(config: Pick<Config, 'dataDir' | 'storage'>): UploadStorage {
  const s = config.storage;
  if (s.kind === 's3') return new S3Storage({ client: createS3Client(s), bucket: s.bucket, prefix: s.prefix });
  return new LocalDiskStorage(path.join(config.dataDir, 'uploads'));
}
