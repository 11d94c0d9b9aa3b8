/** Server configuration, read from the environment only and validated with zod. */
import path from 'node:path';
import { z } from 'zod';

const envSchema = z
  .object({
    NODE_ENV: z.enum(['development', 'production', 'test']).default('development'),
    PORT: z.coerce.number().int('PORT must be a whole number').min(1, 'PORT must be 1–65535').max(65535, 'PORT must be 1–65535').default(3000),
    DATA_DIR: z.string().min(1, 'DATA_DIR must not be empty').default('./data'),
    DATABASE_URL: z
      .string()
      .regex(/^postgres(ql)?:\/\/.+/, 'DATABASE_URL must be a postgres://… URL')
      .optional(),
    SMTP_URL: z
      .string()
      .regex(/^smtps?:\/\/.+/, 'SMTP_URL must be an smtp:// or smtps:// URL')
      .optional(),
    APP_ORIGIN: z
      .url('APP_ORIGIN must be a URL such as https://bankwright.example.com')
      .refine((v) => /^https?:\/\//.test(v), 'APP_ORIGIN must start with http:// or https://')
      .optional(),
    DEMO: z.enum(['0', '1'], { error: 'DEMO must be 0 or 1' }).default('1'),
    DEMO_PASSWORD: z.string().min(10, 'DEMO_PASSWORD must be at least 10 characters').default('bankwright-demo'),
    UPLOAD_MAX_MB: z.coerce
      .number('UPLOAD_MAX_MB must be a number')
      .min(0.001, 'UPLOAD_MAX_MB must be more than 0')
      .max(200, 'UPLOAD_MAX_MB must be at most 200')
      .default(20),
    S3_BUCKET: z.string().regex(/^[a-z0-9][a-z0-9.-]{1,61}[a-z0-9]$/, 'S3_BUCKET must be a bucket name (3–63 lower-case letters, digits, dots, hyphens)').optional(),
    S3_ENDPOINT: z.url('S3_ENDPOINT must be a URL such as https://s3.example.com').optional(),
    S3_REGION: z.string().min(1).default('us-east-1'),
    S3_PREFIX: z.string().regex(/^[A-Za-z0-9/_-]{0,100}$/, 'S3_PREFIX may hold letters, digits, /, _ and -').default(''),
    S3_FORCE_PATH_STYLE: z.enum(['0', '1'], { error: 'S3_FORCE_PATH_STYLE must be 0 or 1' }).optional(),
  })
  .transform((e) => ({
    nodeEnv: e.NODE_ENV,
    port: e.PORT,
    dataDir: path.resolve(e.DATA_DIR),
    databaseUrl: e.DATABASE_URL,
    smtpUrl: e.SMTP_URL,
    appOrigin: new URL(e.APP_ORIGIN ?? `http://localhost:${e.PORT}`).origin,
    demo: e.DEMO !== '0',
    demoPassword: e.DEMO_PASSWORD,
    uploadMaxBytes: Math.round(e.UPLOAD_MAX_MB * 1024 * 1024),
    /** Where uploaded files go: DATA_DIR/uploads, or an S3-compatible bucket when S3_BUCKET is set. */
    storage: e.S3_BUCKET
      ? {
          kind: 's3' as const,
          bucket: e.S3_BUCKET,
          endpoint: e.S3_ENDPOINT,
          region: e.S3_REGION,
          prefix: e.S3_PREFIX,
          // Most S3-compatible servers (MinIO, Garage, Ceph) want path-style addressing.
          forcePathStyle: e.S3_FORCE_PATH_STYLE ? e.S3_FORCE_PATH_STYLE === '1' : e.S3_ENDPOINT !== undefined,
        }
      : { kind: 'local' as const },
  }));

export type Config = z.output<typeof envSchema>;

export class ConfigError extends Error {}

/** Parse the environment; throws ConfigError naming every bad variable. Empty strings count as unset. */
export function loadConfig(env: NodeJS.ProcessEnv = process.env): Config {
  const cleaned = Object.fromEntries(Object.entries(env).filter(([, v]) => v !== undefined && v !== ''));
  const parsed = envSchema.safeParse(cleaned);
  if (!parsed.success) {
    const lines = parsed.error.issues.map((i) => `  ${i.path.join('.') || 'env'}: ${i.message}`);
    throw new ConfigError(`Invalid configuration:\n${lines.join('\n')}`);
  }
  return parsed.data;
}

/** Configuration for tests and tools: defaults plus overrides, no environment. */
export function testConfig(overrides: Partial<Config> = {}): Config {
  return { ...loadConfig({ NODE_ENV: 'test' }), appOrigin: 'http://bankwright.test', ...overrides };
}
