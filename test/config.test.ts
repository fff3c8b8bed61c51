import { randomBytes } from 'node:crypto';
import { describe, expect, it } from 'vitest';
import { loadConfig } from '../server/config';
import { testApp } from './support/app';

const secret = () => randomBytes(24).toString('base64url');
/** A production environment that passes; each test breaks one thing. */
const production = (): Record<string, string | undefined> => ({
  NODE_ENV: 'production',
  DATABASE_URL: 'postgres://app@db.internal/seasonwell',
  SESSION_SECRET: secret(),
  JWT_SECRET: secret(),
  STRIPE_SECRET_KEY: `sk_live_${secret()}`,
  STRIPE_WEBHOOK_SECRET: `whsec_${secret()}`,
  SMTP_URL: 'smtps://mailer:pw@smtp.example.test:465',
});

function refusal(env: Record<string, string | undefined>): string {
  try {
    loadConfig(env);
  } catch (err) {
    return (err as Error).message;
  }
  throw new Error('the configuration was accepted');
}

describe('loadConfig', () => {
  it('runs locally with no settings at all, on the repository defaults', () => {
    const c = loadConfig({});
    expect(c.production).toBe(false);
    expect(c.SESSION_SECRET).toMatch(/^dev-only/);
    expect(c.SMTP_URL).toBe('smtp://127.0.0.1:2526');
    expect(c.TRUST_PROXY).toBe('loopback');
  });

  it('accepts a production environment that sets every secret', () => {
    const env = production();
    const c = loadConfig(env);
    expect(c.production).toBe(true);
    expect(c.STRIPE_WEBHOOK_SECRET).toBe(env.STRIPE_WEBHOOK_SECRET);
  });

  for (const name of ['SESSION_SECRET', 'JWT_SECRET', 'STRIPE_WEBHOOK_SECRET', 'STRIPE_SECRET_KEY']) {
    it(`refuses production without ${name}, naming it`, () => {
      expect(refusal({ ...production(), [name]: undefined })).toMatch(new RegExp(`${name}: must be set in production`));
      // An empty value counts as unset.
      expect(refusal({ ...production(), [name]: '' })).toMatch(new RegExp(`${name}: must be set in production`));
    });
  }

  it.each([
    ['SESSION_SECRET', 'dev-only-session-secret-change-me'],
    ['JWT_SECRET', 'dev-only-jwt-secret-change-me-now'],
    ['STRIPE_SECRET_KEY', 'sk_test_seasonwell_local'],
    ['STRIPE_WEBHOOK_SECRET', 'whsec_seasonwell_local'],
    // Another repository value in the wrong place is no better.
    ['STRIPE_WEBHOOK_SECRET', 'dev-only-session-secret-change-me'],
    ['SESSION_SECRET', 'dev-only-but-longer-than-sixteen'],
  ])('refuses production when %s is the repository value %s', (name, value) => {
    expect(refusal({ ...production(), [name]: value })).toMatch(new RegExp(`${name}: must not be the development value from the repository`));
  });

  it('refuses production without a mailer, naming SMTP_URL', () => {
    expect(refusal({ ...production(), SMTP_URL: undefined })).toMatch(/SMTP_URL: must be set in production/);
  });

  it('refuses production with a bucket but no S3 credentials', () => {
    const message = refusal({ ...production(), STORAGE_S3_BUCKET: 'seasonwell-uploads' });
    expect(message).toMatch(/STORAGE_S3_SECRET_ACCESS_KEY: must be set in production when STORAGE_S3_BUCKET is set/);
    expect(message).toMatch(/STORAGE_S3_ACCESS_KEY_ID: must be set/);
    expect(() => loadConfig({ ...production(), STORAGE_S3_BUCKET: 'b', STORAGE_S3_ACCESS_KEY_ID: 'AKIDEXAMPLE', STORAGE_S3_SECRET_ACCESS_KEY: secret() })).not.toThrow();
  });

  it('lists every problem at once', () => {
    const message = refusal({ NODE_ENV: 'production' });
    for (const name of ['SESSION_SECRET', 'JWT_SECRET', 'STRIPE_WEBHOOK_SECRET', 'STRIPE_SECRET_KEY', 'SMTP_URL']) expect(message).toContain(name);
  });

  it('reads the proxy trust setting', () => {
    expect(loadConfig({ TRUST_PROXY: '1' }).TRUST_PROXY).toBe(1);
    expect(loadConfig({ TRUST_PROXY: 'false' }).TRUST_PROXY).toBe(false);
    expect(loadConfig({ TRUST_PROXY: 'true' }).TRUST_PROXY).toBe(true);
    expect(loadConfig({ TRUST_PROXY: '10.0.0.0/8, loopback' }).TRUST_PROXY).toBe('10.0.0.0/8, loopback');
  });

  it('hands the proxy trust setting to the app', async () => {
    for (const [value, expected] of [
      ['false', false],
      ['2', 2],
      ['loopback', 'loopback'],
    ] as const) {
      const ctx = testApp({ env: { TRUST_PROXY: value } });
      expect(ctx.app.get('trust proxy')).toBe(expected);
      await ctx.close();
    }
  });
});
