import { z } from 'zod';

// Every setting comes from the environment, parsed once here. Defaults run locally with no set-up.
const schema = z.object({
  NODE_ENV: z.enum(['development', 'test', 'production']).default('development'),
  HOST: z.string().default('127.0.0.1'),
  PORT: z.coerce.number().int().min(0).max(65535).default(3100),
  PUBLIC_URL: z.url().optional(),
  DATABASE_URL: z.string().default('postgres://postgres@127.0.0.1:55432/seasonwell'),
  DATABASE_POOL_MAX: z.coerce.number().int().min(1).default(10),
  SESSION_SECRET: z.string().min(16).default('dev-only-session-secret-change-me'),
  JWT_SECRET: z.string().min(16).default('dev-only-jwt-secret-change-me-now'),
  SMTP_URL: z.string().default('smtp://127.0.0.1:2526'),
  MAIL_FROM: z.string().default('Seasonwell <hello@seasonwell.test>'),
  MAILBOX_URL: z.string().optional(),
  STRIPE_SECRET_KEY: z.string().default('sk_test_seasonwell_local'),
  STRIPE_WEBHOOK_SECRET: z.string().default('whsec_seasonwell_local'),
  STRIPE_API_URL: z.url().optional(),
  STORAGE_DIR: z.string().default('.data/uploads'),
  // Any S3-compatible store; when the bucket is unset, files go to STORAGE_DIR.
  STORAGE_S3_BUCKET: z.string().optional(),
  STORAGE_S3_ENDPOINT: z.url().optional(),
  STORAGE_S3_REGION: z.string().default('us-east-1'),
  STORAGE_S3_ACCESS_KEY_ID: z.string().optional(),
  STORAGE_S3_SECRET_ACCESS_KEY: z.string().optional(),
  CLIENT_DIST: z.string().default('dist/seasonwell/browser'),
  LOG_LEVEL: z.enum(['fatal', 'error', 'warn', 'info', 'debug', 'trace', 'silent']).default('info'),
  RUN_JOBS: z
    .enum(['true', 'false'])
    .default('true')
    .transform((v) => v === 'true'),
});

export type Config = z.infer<typeof schema> & { publicUrl: string; production: boolean };

export function loadConfig(env: Record<string, string | undefined> = process.env): Config {
  const parsed = schema.safeParse(env);
  if (!parsed.success) {
    const lines = parsed.error.issues.map((i) => `  ${i.path.join('.')}: ${i.message}`).join('\n');
    throw new Error(`Configuration is not valid:\n${lines}`);
  }
  const c = parsed.data;
  const production = c.NODE_ENV === 'production';
  if (production && (c.SESSION_SECRET.startsWith('dev-only') || c.JWT_SECRET.startsWith('dev-only'))) {
    throw new Error('Configuration is not valid:\n  SESSION_SECRET and JWT_SECRET must be set in production');
  }
  return { ...c, production, publicUrl: c.PUBLIC_URL ?? `http://localhost:${c.PORT}` };
}
