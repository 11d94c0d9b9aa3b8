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
    /** Storage quota per team for attached files (MB, default 2048 = 2 GB). */
    UPLOAD_TEAM_QUOTA_MB: z.coerce
      .number('UPLOAD_TEAM_QUOTA_MB must be a number of megabytes')
      .min(1, 'UPLOAD_TEAM_QUOTA_MB must be 1–10000000')
      .max(10_000_000, 'UPLOAD_TEAM_QUOTA_MB must be 1–10000000')
      .default(2048),
    /** Uploads one person may start per UPLOAD_RATE_MINUTES (default 30 per 10 minutes). */
    UPLOAD_RATE_MAX: z.coerce.number('UPLOAD_RATE_MAX must be a number').int('UPLOAD_RATE_MAX must be a whole number').min(1, 'UPLOAD_RATE_MAX must be 1–100000').max(100_000, 'UPLOAD_RATE_MAX must be 1–100000').default(30),
    UPLOAD_RATE_MINUTES: z.coerce.number('UPLOAD_RATE_MINUTES must be a number').int('UPLOAD_RATE_MINUTES must be a whole number').min(1, 'UPLOAD_RATE_MINUTES must be 1–1440').max(1440, 'UPLOAD_RATE_MINUTES must be 1–1440').default(10),
    /** pino log level; tests default to silent. */
    LOG_LEVEL: z.enum(['fatal', 'error', 'warn', 'info', 'debug', 'trace', 'silent'], { error: 'LOG_LEVEL must be one of fatal, error, warn, info, debug, trace, silent' }).optional(),
    S3_BUCKET: z.string().regex(/^[a-z0-9][a-z0-9.-]{1,61}[a-z0-9]$/, 'S3_BUCKET must be a bucket name (3–63 lower-case letters, digits, dots, hyphens)').optional(),
    S3_ENDPOINT: z.url('S3_ENDPOINT must be a URL such as https://s3.example.com').optional(),
    S3_REGION: z.string().min(1).default('us-east-1'),
    S3_PREFIX: z.string().regex(/^[A-Za-z0-9/_-]{0,100}$/, 'S3_PREFIX may hold letters, digits, /, _ and -').default(''),
    S3_FORCE_PATH_STYLE: z.enum(['0', '1'], { error: 'S3_FORCE_PATH_STYLE must be 0 or 1' }).optional(),
    /** Scheduled backups of the embedded database (PGlite only): minutes between backups, 0 = off. */
    BACKUP_INTERVAL_MINUTES: z.coerce
      .number('BACKUP_INTERVAL_MINUTES must be a number of minutes')
      .int('BACKUP_INTERVAL_MINUTES must be a whole number of minutes')
      .min(0, 'BACKUP_INTERVAL_MINUTES must be from 1 to 10080 (or 0 for off)')
      .max(7 * 24 * 60, 'BACKUP_INTERVAL_MINUTES must be from 1 to 10080 (or 0 for off)')
      .default(0),
    BACKUP_DIR: z.string().min(1).optional(),
    BACKUP_KEEP: z.coerce.number('BACKUP_KEEP must be a number').int('BACKUP_KEEP must be a whole number').min(1, 'BACKUP_KEEP must be at least 1').max(10_000, 'BACKUP_KEEP must be at most 10000').default(14),
    /** Reverse proxies in front of the server whose X-Forwarded-For is believed (0: use the socket's address). */
    TRUST_PROXY: z.coerce.number('TRUST_PROXY must be a number of proxies').int('TRUST_PROXY must be a whole number of proxies').min(0, 'TRUST_PROXY must be 0–10').max(10, 'TRUST_PROXY must be 0–10').default(0),
    /** Analysis worker threads (default: one per core, at most 4), jobs allowed to wait, and a job's time limit. */
    ANALYSIS_WORKERS: z.coerce.number('ANALYSIS_WORKERS must be a number').int('ANALYSIS_WORKERS must be a whole number').min(1, 'ANALYSIS_WORKERS must be 1–16').max(16, 'ANALYSIS_WORKERS must be 1–16').optional(),
    ANALYSIS_QUEUE: z.coerce.number('ANALYSIS_QUEUE must be a number').int('ANALYSIS_QUEUE must be a whole number').min(0, 'ANALYSIS_QUEUE must be 0–10000').max(10_000, 'ANALYSIS_QUEUE must be 0–10000').default(100),
    ANALYSIS_TIMEOUT_SECONDS: z.coerce
      .number('ANALYSIS_TIMEOUT_SECONDS must be a number')
      .min(1, 'ANALYSIS_TIMEOUT_SECONDS must be 1–3600')
      .max(3600, 'ANALYSIS_TIMEOUT_SECONDS must be 1–3600')
      .default(60),
  })
  .superRefine((e, ctx) => {
    if (!e.BACKUP_DIR) return;
    const pglite = path.resolve(e.DATA_DIR, 'pglite');
    const dir = path.resolve(e.BACKUP_DIR);
    if (dir === pglite || dir.startsWith(pglite + path.sep)) ctx.addIssue({ code: 'custom', path: ['BACKUP_DIR'], message: 'BACKUP_DIR must not be inside DATA_DIR/pglite' });
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
    /** Express's `trust proxy` hop count (server/app.ts); 0 = off. */
    trustProxy: e.TRUST_PROXY,
    uploadMaxBytes: Math.round(e.UPLOAD_MAX_MB * 1024 * 1024),
    /** Per-team storage quota and per-user upload rate (server/services/upload-limits.ts). */
    uploadQuota: {
      teamBytes: Math.round(e.UPLOAD_TEAM_QUOTA_MB * 1024 * 1024),
      ratePerUser: e.UPLOAD_RATE_MAX,
      rateWindowSeconds: e.UPLOAD_RATE_MINUTES * 60,
    },
    logLevel: e.LOG_LEVEL ?? (e.NODE_ENV === 'test' ? ('silent' as const) : ('info' as const)),
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
    /** Scheduled backups (PGlite only; ignored with DATABASE_URL); null when off. BACKUP_DIR defaults to DATA_DIR/backups. */
    backups:
      e.BACKUP_INTERVAL_MINUTES > 0
        ? { intervalMinutes: e.BACKUP_INTERVAL_MINUTES, dir: e.BACKUP_DIR ? path.resolve(e.BACKUP_DIR) : path.join(path.resolve(e.DATA_DIR), 'backups'), keep: e.BACKUP_KEEP }
        : null,
    /** The analysis worker pool (server/services/analysis-pool.ts); workers undefined = one per core, at most 4. */
    analysis: { workers: e.ANALYSIS_WORKERS, maxQueued: e.ANALYSIS_QUEUE, timeoutMs: Math.round(e.ANALYSIS_TIMEOUT_SECONDS * 1000) },
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
