import { randomBytes } from 'node:crypto';
import { mkdtempSync, rmSync } from 'node:fs';
import type { AddressInfo } from 'node:net';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
// @ts-expect-error s3rver ships no types
import S3rver from 's3rver';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createLocalStorage, createS3Storage, newStorageKey, StoredObjectMissing, type Storage } from '../server/integrations/storage';

let s3dir: string;
let localDir: string;
let server: { run(): Promise<AddressInfo>; close(): Promise<void> };
let s3: Storage;

beforeAll(async () => {
  s3dir = mkdtempSync(join(tmpdir(), 'sw-s3rver-'));
  localDir = mkdtempSync(join(tmpdir(), 'sw-local-'));
  server = new S3rver({ port: 0, address: '127.0.0.1', silent: true, directory: s3dir, configureBuckets: [{ name: 'seasonwell-test' }] });
  const { port } = await server.run();
  // s3rver accepts the fixed access key it documents: S3RVER / S3RVER.
  s3 = createS3Storage({ bucket: 'seasonwell-test', endpoint: `http://127.0.0.1:${port}`, accessKeyId: 'S3RVER', secretAccessKey: 'S3RVER', forcePathStyle: true });
});
afterAll(async () => {
  await server.close();
  rmSync(s3dir, { recursive: true, force: true });
  rmSync(localDir, { recursive: true, force: true });
});

describe.each([
  ['S3 driver against s3rver', () => s3],
  ['local folder driver', () => createLocalStorage(localDir)],
])('%s', (_name, storage) => {
  it('round-trips bytes exactly, reports existence, and deletes', async () => {
    const st = storage();
    const key = newStorageKey(new Date('2026-05-04T12:00:00Z'), 'jpg');
    expect(key).toMatch(/^files\/2026\/05\/[0-9a-f-]{36}\.jpg$/);
    const body = randomBytes(300_000);
    expect(await st.exists(key)).toBe(false);
    await st.put(key, body, 'image/jpeg');
    expect(await st.exists(key)).toBe(true);
    const back = await st.get(key);
    expect(back.equals(body)).toBe(true);
    await st.delete(key);
    expect(await st.exists(key)).toBe(false);
    await expect(st.get(key)).rejects.toBeInstanceOf(StoredObjectMissing);
  });

  it('refuses keys that try to leave the storage area', async () => {
    const st = storage();
    await expect(st.put('../etc/passwd', Buffer.from('x'), 'text/plain')).rejects.toThrow(/not valid/);
    await expect(st.put('files/../../x', Buffer.from('x'), 'text/plain')).rejects.toThrow(/not valid/);
    await expect(st.get('/abs/path')).rejects.toThrow(/not valid/);
  });
});
