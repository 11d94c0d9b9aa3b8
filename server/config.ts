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
