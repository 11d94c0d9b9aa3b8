/**
 * Uploads in an S3-compatible bucket through the AWS SDK (AWS S3, MinIO, Garage, Ceph RGW …).
 * Credentials come from the SDK's standard chain (AWS_ACCESS_KEY_ID / AWS_SECRET_ACCESS_KEY, a
 * profile, or an instance role); nothing is read here. The client is injected so tests use a fake.
 */
import { Readable } from 'node:stream';
import { DeleteObjectCommand, GetObjectCommand, PutObjectCommand, S3Client } from '@aws-sdk/client-s3';
import { assertStorageKey, StorageNotFoundError, type UploadStorage } from './types';

/** The one method of S3Client this adapter uses. */
export interface S3Like {
  send(command: PutObjectCommand | GetObjectCommand | DeleteObjectCommand): Promise<unknown>;
}

export interface S3StorageOptions {
  client: S3Like;
  bucket: string;
  /** Key prefix inside the bucket, e.g. "bankwright/uploads" (no leading or trailing slash needed). */
  prefix?: string;
}

export class S3Storage implements UploadStorage {
  readonly kind = 's3' as const;
  private readonly client: S3Like;
  private readonly bucket: string;
  private readonly prefix: string;

  constructor(options: S3StorageOptions) {
    this.client = options.client;
    this.bucket = options.bucket;
    const p = (options.prefix ?? '').replace(/^\/+|\/+$/g, '');
    this.prefix = p ? `${p}/` : '';
  }

  get location(): string {
    return `s3://${this.bucket}/${this.prefix}`;
  }

  objectKey(key: string): string {
    assertStorageKey(key);
    return `${this.prefix}${key}`;
  }

  async put(key: string, bytes: Uint8Array, contentType: string): Promise<void> {
    await this.client.send(
      new PutObjectCommand({ Bucket: this.bucket, Key: this.objectKey(key), Body: bytes, ContentType: contentType, ContentLength: bytes.byteLength }),
    );
  }

  async get(key: string): Promise<Readable> {
    let out: { Body?: unknown };
    try {
      out = (await this.client.send(new GetObjectCommand({ Bucket: this.bucket, Key: this.objectKey(key) }))) as { Body?: unknown };
    } catch (err) {
      const e = err as { name?: string; $metadata?: { httpStatusCode?: number } };
      if (e?.name === 'NoSuchKey' || e?.name === 'NotFound' || e?.$metadata?.httpStatusCode === 404) throw new StorageNotFoundError(key);
      throw err;
    }
    const body = out.Body;
    if (body instanceof Readable) return body;
    // Non-Node runtimes of the SDK hand back a web stream.
    if (body && typeof (body as { transformToWebStream?: unknown }).transformToWebStream === 'function') {
      return Readable.fromWeb((body as { transformToWebStream(): import('node:stream/web').ReadableStream }).transformToWebStream());
    }
    throw new StorageNotFoundError(key);
  }

  async delete(key: string): Promise<void> {
    await this.client.send(new DeleteObjectCommand({ Bucket: this.bucket, Key: this.objectKey(key) }));
  }
}

export function createS3Client(options: { region: string; endpoint?: string; forcePathStyle: boolean }): S3Client {
  return new S3Client({ region: options.region, endpoint: options.endpoint, forcePathStyle: options.forcePathStyle });
}
