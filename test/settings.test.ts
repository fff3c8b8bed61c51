import { afterAll, describe, expect, it } from 'vitest';
import { testApp } from './support/app';
import { CSRF_HEADER_NAME, signInStaff } from './support/auth';

const OWNER = 'rosalind.okafor@bluestem-comfort.test';
const OFFICE = 'teo.marchetti@bluestem-comfort.test';

describe('company settings', () => {
  const ctx = testApp();
  afterAll(() => ctx.close());

  it('are the owner’s alone: office staff reach no settings', async () => {
    const office = await signInStaff(ctx, OFFICE);
    expect((await office.agent.get('/api/settings/company')).status).toBe(403);
  });

  it('name every field that is wrong and change nothing', async () => {
    const owner = await signInStaff(ctx, OWNER);
    const before = (await owner.agent.get('/api/settings/company')).body;
    const res = await owner.agent
      .put('/api/settings/company')
      .set(CSRF_HEADER_NAME, owner.csrf)
      .send({
        ...before,
        zip: '6479',
        state: 'Missouri',
        timeZone: 'Mars/Olympus',
        businessHours: { ...before.businessHours, '1': { open: '18:00', close: '07:30' } },
        arrivalWindowMinutes: 45,
      });
    expect(res.status).toBe(422);
    expect(res.body.error.fields).toMatchObject({
      zip: 'ZIP code has 5 digits (or ZIP+4).',
      state: expect.stringContaining('two-letter'),
      timeZone: expect.stringContaining('America/Chicago'),
      'businessHours.1': 'Opening time must be before closing time.',
      arrivalWindowMinutes: expect.stringContaining('30 minutes'),
    });
    expect((await owner.agent.get('/api/settings/company')).body).toEqual(before);
  });

  it('save a change, record it in the access log, and keep the rest', async () => {
    const owner = await signInStaff(ctx, OWNER);
    const before = (await owner.agent.get('/api/settings/company')).body;
    const changed = await owner.agent
      .put('/api/settings/company')
      .set(CSRF_HEADER_NAME, owner.csrf)
      .send({ ...before, phone: '+18165550199' });
    expect(changed.status).toBe(200);
    expect(changed.body).toEqual({ ...before, phone: '+18165550199' });
    const restored = await owner.agent.put('/api/settings/company').set(CSRF_HEADER_NAME, owner.csrf).send(before);
    expect(restored.body).toEqual(before);
    const audit = await owner.agent.get('/api/audit?action=settings_changed');
    expect(audit.status).toBe(200);
    expect(JSON.stringify(audit.body)).toContain('settings_changed');
  });

  it('hold the season months: bad months are named, and months left out stay as they are', async () => {
    const owner = await signInStaff(ctx, OWNER);
    const before = (await owner.agent.get('/api/settings/company')).body;
    expect(before).toMatchObject({ coolingStartMonth: expect.any(Number), heatingStartMonth: expect.any(Number) });
    const bad = await owner.agent
      .put('/api/settings/company')
      .set(CSRF_HEADER_NAME, owner.csrf)
      .send({ ...before, coolingStartMonth: 13, heatingStartMonth: 0 });
    expect(bad.status).toBe(422);
    expect(bad.body.error.fields).toMatchObject({
      coolingStartMonth: 'Cooling season start is a month from 1 to 12.',
      heatingStartMonth: 'Heating season start is a month from 1 to 12.',
    });
    const same = await owner.agent
      .put('/api/settings/company')
      .set(CSRF_HEADER_NAME, owner.csrf)
      .send({ ...before, heatingStartMonth: before.coolingStartMonth });
    expect(same.status).toBe(422);
    expect(Object.keys(same.body.error.fields)).toEqual(['heatingStartMonth']);
    // Left out, the months stay as they are.
    const { coolingStartMonth: _c, heatingStartMonth: _h, ...rest } = before;
    const kept = await owner.agent.put('/api/settings/company').set(CSRF_HEADER_NAME, owner.csrf).send(rest);
    expect(kept.status).toBe(200);
    expect(kept.body).toEqual(before);
    expect((await owner.agent.get('/api/settings/company')).body).toEqual(before);
  });
});
