import { randomUUID } from 'node:crypto';
import { DateTime } from 'luxon';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { SERVICE_LIFE } from '../shared/service-life';
import { testApp, type TestContext } from './support/app';
import { signInHomeowner, signInStaff, type Signed } from './support/auth';

let ctx: TestContext;
let office: Signed;
let propertyId: string;
const tag = randomUUID().slice(0, 8);
const today = () => DateTime.now().setZone('America/Chicago');

const post = (s: Signed, url: string, body: unknown) =>
  s.agent
    .post(url)
    .set('X-XSRF-TOKEN', s.csrf)
    .send(body as object);

beforeAll(async () => {
  ctx = testApp();
  office = await signInStaff(ctx, 'teo.marchetti@bluestem-comfort.test');
  const res = await post(office, '/api/customers', {
    name: `Equipment Test ${tag}`,
    phone: '816-555-0190',
    property: { street: '5 Tallgrass Circle', city: 'Larkspur Bend', state: 'MO', zip: '64791' },
  }).expect(201);
  propertyId = res.body.propertyId;
});
afterAll(() => ctx.close());

describe('equipment', () => {
  it('records a condensing unit with capacity in tons, and works out its age and service-life flag', async () => {
    const installed = today().minus({ years: 13, months: 2 }).toISODate()!;
    const res = await post(office, '/api/equipment', {
      propertyId,
      kind: 'condensing_unit',
      make: 'Brakeson',
      model: 'AC36-2',
      serial: `BR${tag}`,
      installedOn: installed,
      refrigerant: 'r410a',
      capacity: 3,
      capacityUnit: 'tons',
      volts: '230',
      phase: 1,
      ratedAmps: 15.6,
      filterSize: '16 X 25 X 1',
      merv: 8,
      warrantyEndsOn: today().plus({ days: 30 }).toISODate(),
      location: 'Side yard',
    }).expect(201);
    // 1 ton = 12,000 Btu/h by definition of the ton of refrigeration.
    expect(res.body).toMatchObject({
      capacityBtuh: 36000,
      capacityTons: 3,
      refrigerant: 'R-410A',
      filterSize: '16x25x1',
      ageYears: 13,
      ageText: '13 years, 2 months',
      warranty: 'ending_soon',
    });
    // 13 of a typical 15 years (ASHRAE median, from memory) is past 80 %: nearing the end.
    expect(SERVICE_LIFE.condensing_unit.years).toBe(15);
    expect(res.body.life).toMatchObject({ status: 'nearing', typicalYears: 15 });
    expect(res.body.life.source).toMatch(/ASHRAE/);
  });

  it('flags a furnace past its typical life and keeps "none" as no refrigerant', async () => {
    const res = await post(office, '/api/equipment', {
      propertyId,
      kind: 'gas_furnace',
      installedOn: today().minus({ years: 19 }).toISODate(),
      refrigerant: 'none',
      capacity: 80000,
    }).expect(201);
    expect(res.body).toMatchObject({ refrigerant: null, capacityBtuh: 80000, life: { status: 'past' }, warranty: 'unknown' });
  });

  it('names each bad field, and refuses an install date after today', async () => {
    const res = await post(office, '/api/equipment', {
      propertyId,
      kind: 'boiler',
      refrigerant: 'R-12',
      capacity: -2,
      phase: 2,
      merv: 20,
      volts: 'lots',
      filterSize: 'big',
      installedOn: '2019-02-30',
      warrantyEndsOn: 'soon',
    }).expect(422);
    expect(Object.keys(res.body.error.fields).sort()).toEqual(['capacity', 'filterSize', 'installedOn', 'kind', 'merv', 'phase', 'refrigerant', 'volts', 'warrantyEndsOn']);
    const future = await post(office, '/api/equipment', { propertyId, kind: 'thermostat', installedOn: today().plus({ days: 2 }).toISODate() }).expect(422);
    expect(future.body.error.fields.installedOn).toMatch(/after today/);
    const tiny = await post(office, '/api/equipment', { propertyId, kind: 'heat_pump', capacity: 0.01, capacityUnit: 'tons' }).expect(422);
    expect(tiny.body.error.fields.capacity).toMatch(/Btu\/h/);
    const early = await post(office, '/api/equipment', { propertyId, kind: 'heat_pump', installedOn: '2020-05-01', warrantyEndsOn: '2019-05-01' }).expect(422);
    expect(early.body.error.fields.warrantyEndsOn).toBeTruthy();
  });

  it("records a variable-speed compressor with its maximum frequency and the blower's maximum static, and R-407C", async () => {
    const res = await post(office, '/api/equipment', {
      propertyId,
      kind: 'heat_pump',
      refrigerant: 'r407c',
      compressorType: 'variable_speed',
      maxCompressorHz: '120',
      maxExternalStaticInWc: 0.8,
    }).expect(201);
    expect(res.body).toMatchObject({ refrigerant: 'R-407C', compressorType: 'variable_speed', maxCompressorHz: 120, maxExternalStaticInWc: 0.8 });
    const got = await office.agent.get(`/api/equipment/${res.body.id}`).expect(200);
    expect(got.body).toMatchObject({ compressorType: 'variable_speed', maxCompressorHz: 120, maxExternalStaticInWc: 0.8 });
    const plain = await post(office, '/api/equipment', { propertyId, kind: 'condensing_unit' }).expect(201);
    expect(plain.body).toMatchObject({ compressorType: null, maxCompressorHz: null, maxExternalStaticInWc: null });
  });

  it('names the compressor and static fields when they are wrong', async () => {
    const res = await post(office, '/api/equipment', { propertyId, kind: 'heat_pump', compressorType: 'inverter', maxCompressorHz: 0, maxExternalStaticInWc: 3 }).expect(422);
    expect(Object.keys(res.body.error.fields).sort()).toEqual(['compressorType', 'maxCompressorHz', 'maxExternalStaticInWc']);
    const high = await post(office, '/api/equipment', { propertyId, kind: 'heat_pump', compressorType: 'variable_speed', maxCompressorHz: 301 }).expect(422);
    expect(high.body.error.fields.maxCompressorHz).toMatch(/300 Hz/);
    const fixed = await post(office, '/api/equipment', { propertyId, kind: 'heat_pump', compressorType: 'two_stage', maxCompressorHz: 90 }).expect(422);
    expect(fixed.body.error.fields.maxCompressorHz).toMatch(/variable-speed/);
    // A change that makes a unit with a maximum frequency fixed-speed is refused the same way.
    const vs = await post(office, '/api/equipment', { propertyId, kind: 'heat_pump', compressorType: 'variable_speed', maxCompressorHz: 100 }).expect(201);
    const upd = await office.agent.patch(`/api/equipment/${vs.body.id}`).set('X-XSRF-TOKEN', office.csrf).send({ compressorType: 'fixed_speed' }).expect(422);
    expect(Object.keys(upd.body.error.fields)).toEqual(['maxCompressorHz']);
    const cleared = await office.agent
      .patch(`/api/equipment/${vs.body.id}`)
      .set('X-XSRF-TOKEN', office.csrf)
      .send({ compressorType: 'fixed_speed', maxCompressorHz: '' })
      .expect(200);
    expect(cleared.body).toMatchObject({ compressorType: 'fixed_speed', maxCompressorHz: null });
  });

  it('edits and archives equipment without losing it', async () => {
    const made = await post(office, '/api/equipment', { propertyId, kind: 'humidifier', make: 'Quintaire' }).expect(201);
    const upd = await office.agent.patch(`/api/equipment/${made.body.id}`).set('X-XSRF-TOKEN', office.csrf).send({ model: 'HB-2', installedOn: '2021-04-01' }).expect(200);
    expect(upd.body).toMatchObject({ model: 'HB-2', installedOn: '2021-04-01', make: 'Quintaire' });
    await post(office, `/api/equipment/${made.body.id}/archive`, {}).expect(200);
    const list = await office.agent.get('/api/equipment').query({ propertyId }).expect(200);
    expect(list.body.map((e: { id: string }) => e.id)).not.toContain(made.body.id);
    const all = await office.agent.get('/api/equipment').query({ propertyId, archived: 'true' }).expect(200);
    expect(all.body.find((e: { id: string }) => e.id === made.body.id)).toMatchObject({ archived: true });
  });

  it('is out of reach for a technician with no visit there, and for homeowners of other households', async () => {
    const made = await post(office, '/api/equipment', { propertyId, kind: 'air_cleaner' }).expect(201);
    const tech = await signInStaff(ctx, 'eli.castellan@bluestem-comfort.test');
    await tech.agent.get(`/api/equipment/${made.body.id}`).expect(404);
    // An id in the body that the caller may not use is refused naming the field, like any bad value.
    expect((await post(tech, '/api/equipment', { propertyId, kind: 'thermostat' }).expect(422)).body.error.fields.propertyId).toMatch(/not found/);
    const dana = await signInHomeowner(ctx, 'dana.whitfield@example.test');
    await dana.agent.get(`/api/equipment/${made.body.id}`).expect(403);
    await post(tech, `/api/equipment/${made.body.id}/archive`, {}).expect(403);
  });
});
