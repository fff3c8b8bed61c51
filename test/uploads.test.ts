import { randomUUID } from 'node:crypto';
import { mkdtempSync, readdirSync, rmSync, statSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { eq } from 'drizzle-orm';
import sharp from 'sharp';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { files } from '../server/db/schema';
import { createLocalStorage } from '../server/integrations/storage';
import { testApp, type TestContext } from './support/app';
import { signInHomeowner, signInStaff, type Signed } from './support/auth';

let ctx: TestContext;
let dir: string;
let office: Signed;
let dana: Signed;
let sam: Signed;
let customerId: string;
let propertyId: string;
const tag = randomUUID().slice(0, 8);

/** Every stored object under the storage folder (recursive), to prove rejected uploads leave nothing. */
function storedObjects(): string[] {
  const out: string[] = [];
  const walk = (d: string) => {
    for (const name of readdirSync(d)) {
      const p = join(d, name);
      if (statSync(p).isDirectory()) walk(p);
      else out.push(p);
    }
  };
  walk(dir);
  return out;
}

/**
 * Finds the GPS IFD pointer (tag 0x8825) in a JPEG's EXIF block by walking the TIFF structure,
 * as laid out in the Exif standard (CIPA DC-008, JEITA CP-3451): APP1 "Exif\0\0", TIFF header, IFD0.
 */
function jpegHasGps(buf: Buffer): boolean {
  let i = 2;
  while (i + 4 < buf.length && buf[i] === 0xff) {
    const marker = buf[i + 1]!;
    const len = buf.readUInt16BE(i + 2);
    if (marker === 0xe1 && buf.toString('latin1', i + 4, i + 10) === 'Exif\0\0') {
      const tiff = i + 10;
      const le = buf.toString('latin1', tiff, tiff + 2) === 'II';
      const u16 = (o: number) => (le ? buf.readUInt16LE(o) : buf.readUInt16BE(o));
      const u32 = (o: number) => (le ? buf.readUInt32LE(o) : buf.readUInt32BE(o));
      const ifd0 = tiff + u32(tiff + 4);
      const n = u16(ifd0);
      for (let k = 0; k < n; k++) if (u16(ifd0 + 2 + k * 12) === 0x8825) return true;
      return false;
    }
    if (marker === 0xda) break;
    i += 2 + len;
  }
  return false;
}

async function photoWithGps(): Promise<Buffer> {
  return sharp({ create: { width: 640, height: 480, channels: 3, background: '#4a7f9c' } })
    .jpeg()
    .withExif({ IFD0: { Make: 'TestCam', Model: 'Nameplate' }, IFD3: { GPSLatitudeRef: 'N', GPSLatitude: '39/1 5/1 0/1', GPSLongitudeRef: 'W', GPSLongitude: '94/1 34/1 0/1' } })
    .toBuffer();
}

const upload = (s: Signed, fields: Record<string, string>) => {
  const req = s.agent.post('/api/files').set('X-XSRF-TOKEN', s.csrf);
  for (const [k, v] of Object.entries(fields)) req.field(k, v);
  return req;
};

beforeAll(async () => {
  dir = mkdtempSync(join(tmpdir(), 'sw-uploads-'));
  ctx = testApp({ storage: createLocalStorage(dir) });
  office = await signInStaff(ctx, 'teo.marchetti@bluestem-comfort.test');
  dana = await signInHomeowner(ctx, 'dana.whitfield@example.test');
  sam = await signInHomeowner(ctx, 'sam.oduya@example.test');
  const res = await office.agent
    .post('/api/customers')
    .set('X-XSRF-TOKEN', office.csrf)
    .send({ name: `Upload Test ${tag}`, email: `uploads.${tag}@example.test`, property: { street: '77 Kestrel Street', city: 'Larkspur Bend', state: 'MO', zip: '64790' } })
    .expect(201);
  customerId = res.body.id;
  propertyId = res.body.propertyId;
});
afterAll(async () => {
  await ctx.close();
  rmSync(dir, { recursive: true, force: true });
});

describe('uploads', () => {
  it('re-encodes a nameplate photo, drops its EXIF GPS block and makes a thumbnail', async () => {
    const original = await photoWithGps();
    expect(jpegHasGps(original)).toBe(true);
    const res = await upload(office, { propertyId, category: 'nameplate' }).attach('files', original, { filename: 'nameplate.jpg', contentType: 'image/jpeg' }).expect(201);
    expect(res.body).toHaveLength(1);
    const f = res.body[0];
    expect(f).toMatchObject({ contentType: 'image/jpeg', category: 'nameplate', width: 640, height: 480, originalName: 'nameplate.jpg' });
    const got = await office.agent
      .get(f.url)
      .buffer(true)
      .parse((r, cb) => {
        const chunks: Buffer[] = [];
        r.on('data', (c: Buffer) => chunks.push(c));
        r.on('end', () => cb(null, Buffer.concat(chunks)));
      });
    expect(got.status).toBe(200);
    expect(got.headers['content-disposition']).toMatch(/^inline; filename="nameplate.jpg"/);
    expect(got.headers['content-type']).toBe('image/jpeg');
    const body = got.body as Buffer;
    expect(jpegHasGps(body)).toBe(false);
    expect((await sharp(body).metadata()).exif).toBeUndefined();
    const thumb = await office.agent.get(f.thumbUrl).expect(200);
    expect(thumb.headers['content-type']).toBe('image/webp');
    const [row] = await ctx.database.db.select().from(files).where(eq(files.id, f.id));
    // The storage key is ours, not the uploaded name.
    expect(row!.storageKey).toMatch(/^files\/\d{4}\/\d{2}\/[0-9a-f-]{36}\.jpg$/);
  });

  it('refuses a file over 10 MB with 413 and stores nothing', async () => {
    const before = storedObjects().length;
    const [{ n: rowsBefore }] = (await ctx.database.pool.query('select count(*)::int as n from files')).rows;
    const big = Buffer.alloc(10 * 1024 * 1024 + 1, 0x41);
    const res = await upload(office, { propertyId }).attach('files', big, { filename: 'big.pdf', contentType: 'application/pdf' });
    expect(res.status).toBe(413);
    expect(res.body.error.code).toBe('file_too_large');
    expect(storedObjects().length).toBe(before);
    const [{ n: rowsAfter }] = (await ctx.database.pool.query('select count(*)::int as n from files')).rows;
    expect(rowsAfter).toBe(rowsBefore);
  });

  it('refuses an executable renamed .jpg with 415, even alongside a good photo, and stores nothing', async () => {
    const before = storedObjects().length;
    const [{ n: rowsBefore }] = (await ctx.database.pool.query('select count(*)::int as n from files')).rows;
    // An ELF header (the start of any Linux executable), then padding.
    const elf = Buffer.concat([Buffer.from([0x7f, 0x45, 0x4c, 0x46, 0x02, 0x01, 0x01, 0x00]), Buffer.alloc(4096, 0)]);
    const good = await photoWithGps();
    const res = await upload(office, { propertyId })
      .attach('files', good, { filename: 'ok.jpg', contentType: 'image/jpeg' })
      .attach('files', elf, { filename: 'nameplate.jpg', contentType: 'image/jpeg' });
    expect(res.status).toBe(415);
    expect(res.body.error.message).toMatch(/nameplate/);
    expect(storedObjects().length).toBe(before);
    const [{ n: rowsAfter }] = (await ctx.database.pool.query('select count(*)::int as n from files')).rows;
    expect(rowsAfter).toBe(rowsBefore);
  });

  it('accepts a PDF and serves it as a download', async () => {
    const pdf = Buffer.from('%PDF-1.4\n1 0 obj<<>>endobj\ntrailer<<>>\n%%EOF\n');
    const res = await upload(office, { customerId, category: 'document' })
      .attach('files', pdf, { filename: 'warranty card.pdf', contentType: 'application/octet-stream' })
      .expect(201);
    const got = await office.agent.get(res.body[0].url).expect(200);
    expect(got.headers['content-disposition']).toBe(`attachment; filename="warranty card.pdf"; filename*=UTF-8''warranty%20card.pdf`);
    expect(got.headers['content-type']).toBe('application/pdf');
  });

  it('takes at most 10 files in one request', async () => {
    const tiny = await sharp({ create: { width: 8, height: 8, channels: 3, background: '#fff' } })
      .png()
      .toBuffer();
    let req = upload(office, { propertyId });
    for (let i = 0; i < 11; i++) req = req.attach('files', tiny, { filename: `p${i}.png`, contentType: 'image/png' });
    const res = await req;
    expect(res.status).toBe(413);
    expect(res.body.error.code).toBe('too_many_files');
  });

  it('serves files only to people who may see the household (404 otherwise)', async () => {
    const res = await upload(office, { propertyId, category: 'problem' })
      .attach('files', await photoWithGps(), { filename: 'leak.jpg', contentType: 'image/jpeg' })
      .expect(201);
    await sam.agent.get(res.body[0].url).expect(404);
    await dana.agent.get(res.body[0].url).expect(404);
    const tech = await signInStaff(ctx, 'priya.dunmore@bluestem-comfort.test');
    await tech.agent.get(res.body[0].url).expect(404);
    await request(ctx.app).get(res.body[0].url).expect(401);
    await upload(sam, { propertyId })
      .attach('files', await photoWithGps(), { filename: 'x.jpg', contentType: 'image/jpeg' })
      .expect(422);
    const wrong = await upload(office, { propertyId, category: 'selfie' })
      .attach('files', await photoWithGps(), { filename: 'x.jpg' })
      .expect(422);
    expect(wrong.body.error.fields.category).toBeTruthy();
  });

  it('lets a homeowner add a photo to their own home and see it in My home', async () => {
    const mine = (await dana.agent.get('/api/my-home').expect(200)).body;
    const pid = mine.properties[0].id;
    const res = await upload(dana, { propertyId: pid, category: 'problem' })
      .attach('files', await photoWithGps(), { filename: 'drip.jpg', contentType: 'image/jpeg' })
      .expect(201);
    const after = (await dana.agent.get('/api/my-home').expect(200)).body;
    expect(after.files.map((f: { id: string }) => f.id)).toContain(res.body[0].id);
    await dana.agent.get(res.body[0].url).expect(200);
  });
});
