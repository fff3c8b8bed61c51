import { describe, expect, it } from 'vitest';
import { findReplacements, type PartCandidate } from '../shared/part-matching';
import { capacitorSpecSchema, failedCapacitorSchema, failedMotorSchema, motorSpecSchema, type PartSpecInput } from '../shared/schemas/pricebook';

const MY_TRUCK = { id: 'truck-1', kind: 'truck' as const, name: 'Truck 1' };
const OTHER_TRUCK = { id: 'truck-2', kind: 'truck' as const, name: 'Truck 2' };
const SHOP = { id: 'shop', kind: 'shop' as const, name: 'Shop' };

// The failed indoor blower motor, as the technician reads its nameplate.
const failed = failedMotorSchema.parse({
  category: 'motor',
  application: 'indoor_blower',
  horsepower: '1/3',
  volts: '208-230',
  supplyVolts: 230,
  phase: 1,
  rpm: 1075,
  speeds: 3,
  speedsUsed: 2,
  tapsInUse: ['high', 'low'],
  amps: 2.8,
  rotation: 'ccw',
  rotationViewedFrom: 'lead_end',
  shaft: { diameterIn: 0.5, lengthIn: 4 },
  frame: '48',
  oldCapacitorMicrofarads: 7.5,
});

const exactSpec = {
  category: 'motor',
  application: 'indoor_blower',
  horsepower: '1/3',
  volts: '208-230',
  phase: 1,
  rpm: 1075,
  speeds: 3,
  rotation: 'ccw',
  rotationViewedFrom: 'lead_end',
  shaft: { diameterIn: 0.5, lengthIn: 4 },
  frame: '48',
  fla: 2.8,
  taps: [{ horsepower: '1/3', microfarads: 7.5 }],
  capacitorVolts: 370,
};

let n = 0;
function part(spec: Record<string, unknown>, location: PartCandidate['location'] = MY_TRUCK, quantity = 1, sku?: string): PartCandidate {
  n += 1;
  const parsed = spec['category'] === 'motor' ? motorSpecSchema.parse(spec) : capacitorSpecSchema.parse(spec);
  return { itemId: `item-${n}`, sku: sku ?? `SKU-${String(n).padStart(3, '0')}`, name: `Part ${n}`, spec: parsed, location, quantity };
}
const motor = (over: Record<string, unknown>, location?: PartCandidate['location'], quantity?: number) => part({ ...exactSpec, ...over }, location, quantity);
const cap = (over: Partial<Record<keyof PartSpecInput & string, unknown>> & Record<string, unknown>, location?: PartCandidate['location'], quantity?: number) =>
  part({ category: 'capacitor', microfarads: '7.5', volts: 370, shape: 'round', ...over }, location, quantity);

const search = (candidates: PartCandidate[], f: typeof failed | ReturnType<typeof failedCapacitorSchema.parse> = failed) =>
  findReplacements({ failed: f, candidates, thisTruckId: MY_TRUCK.id });
const reasonsOf = (r: ReturnType<typeof search>, c: PartCandidate) => r.refused.find((x) => x.candidate === c)?.reasons.map((x) => `${x.field}: ${x.text}`);

describe('finding a replacement motor', () => {
  it('fits a motor with the same nameplate, with nothing differing, and says the old capacitor size stays', () => {
    const exact = motor({});
    const r = search([exact]);
    expect(r.refused).toEqual([]);
    const fit = r.fits[0]!;
    expect(fit.place).toBe('this_truck');
    expect(fit.differs).toEqual([]);
    expect(fit.matches.map((m) => m.field)).toEqual(['application', 'phase', 'rpm', 'volts', 'horsepower', 'amps', 'speeds', 'rotation', 'shaft', 'frame']);
    expect(fit.needs).toContain('Speed taps: use the same taps as the old motor (high and low); tape off the unused medium lead.');
    expect(fit.needs).toContain('Run capacitor: 7.5 µF 370 V for 1/3 hp, the same size as the old one; fit a new one if the old one tests outside its rating.');
    expect(fit.capacitor).toMatchObject({ microfarads: 7.5, volts: 370 });
  });

  it('fits a multi-horsepower motor set to the old horsepower, with the capacitor for that tap and where to get it', () => {
    const multi = motor(
      {
        horsepower: '1/6-1/2',
        speeds: 4,
        rotation: 'reversible',
        rotationViewedFrom: null,
        shaft: { diameterIn: 0.5, lengthIn: 5 },
        fla: 3.6,
        taps: [
          { horsepower: '1/6', microfarads: 5, amps: 1.6 },
          { horsepower: '1/4', microfarads: 5, amps: 2.1 },
          { horsepower: '1/3', microfarads: 10, amps: 2.6 },
          { horsepower: '1/2', microfarads: 15, amps: 3.6 },
        ],
      },
      OTHER_TRUCK,
      2,
    );
    const capOnTruck = cap({ microfarads: 10 }, MY_TRUCK);
    const capAtShop = cap({ microfarads: 10, volts: 440, shape: 'oval' }, SHOP);
    const wrongCap = cap({ microfarads: 7.5 }, MY_TRUCK);
    const r = search([multi, capOnTruck, capAtShop, wrongCap]);
    const fit = r.fits.find((f) => f.candidate === multi)!;
    expect(fit.place).toBe('other_truck');
    // The 1/3 hp tap draws 2.6 A, under the old 2.8 A, though the motor's top rating (3.6 A at 1/2 hp) is higher.
    expect(fit.matches.find((m) => m.field === 'amps')!.text).toBe("Rated 2.6 A on the 1/3 hp tap: not above the old motor's 2.8 A.");
    expect(fit.matches.find((m) => m.field === 'horsepower')!.text).toBe('Multi-horsepower 1/6–1/2 hp: includes 1/3 hp.');
    expect(fit.differs.map((d) => d.field)).toEqual(['speeds', 'shaft']);
    expect(fit.needs).toEqual([
      'Get it from Truck 2.',
      'Wire it for 1/3 hp on its horsepower tap, as its label shows.',
      'Speed taps: use the same taps as the old motor (high and low); tape off the unused medium-high and medium-low leads.',
      // CCW seen from the lead end is CW seen from the shaft end.
      "Set the rotation to CW seen from the shaft end (CCW seen from the lead end), as the motor's label shows.",
      'Run capacitor: fit 10 µF 370 V for 1/3 hp (the old one is 7.5 µF).',
      'After the swap, check the temperature rise against the rating plate.',
    ]);
    // The capacitor it needs: on this truck first, then the shop's 440 V oval one (a higher voltage is fine).
    expect(fit.capacitor!.fits.map((c) => c.candidate)).toEqual([capOnTruck, capAtShop]);
  });

  it('fits a motor that differs only in rotation because it is reversible', () => {
    const reversible = motor({ rotation: 'reversible', rotationViewedFrom: null }, SHOP);
    const fit = search([reversible]).fits[0]!;
    expect(fit.place).toBe('shop');
    expect(fit.differs).toEqual([]);
    expect(fit.needs).toContain("Set the rotation to CW seen from the shaft end (CCW seen from the lead end), as the motor's label shows.");
  });

  it('reads a fixed rotation from whichever end the nameplate names', () => {
    // CW seen from the shaft end is the old CCW seen from the lead end.
    const sameWay = motor({ rotation: 'cw', rotationViewedFrom: 'shaft_end' });
    const otherWay = motor({ rotation: 'ccw', rotationViewedFrom: 'shaft_end' });
    const r = search([sameWay, otherWay]);
    expect(r.fits.map((f) => f.candidate)).toEqual([sameWay]);
    expect(reasonsOf(r, otherWay)).toEqual(['rotation: Turns CCW seen from the shaft end and is not reversible; the old motor turned CW.']);
  });

  it('refuses a motor of another RPM, saying why', () => {
    const slow = motor({ rpm: 825 });
    expect(reasonsOf(search([slow]), slow)).toEqual(["rpm: 825 RPM; the old motor turns 1075 RPM, and the fan's speed sets the airflow."]);
    // 1050 RPM is the same six-pole speed within 5 %: it fits.
    expect(search([motor({ rpm: 1050 })]).fits).toHaveLength(1);
  });

  it('refuses a motor of another phase, saying why', () => {
    const threePhase = motor({ phase: 3 });
    expect(reasonsOf(search([threePhase]), threePhase)).toEqual(['phase: 3-phase; the old motor is 1-phase, and a motor runs only on the phase it is wound for.']);
  });

  it('refuses a motor whose voltage does not cover the supply, saying why', () => {
    const low = motor({ volts: '115' });
    expect(reasonsOf(search([low]), low)).toEqual(['volts: Rated 115 V; the supply is 230 V.']);
    // A dual-voltage 115/208-230 V motor covers the 230 V supply.
    expect(search([motor({ volts: '115/208-230' })]).fits).toHaveLength(1);
    // On a nominal 240 V supply a 230 V nameplate is the one made for it.
    expect(search([motor({ volts: '230' })], { ...failed, supplyVolts: 240 }).fits).toHaveLength(1);
    // Without the supply, the old 208–230 V rating must be covered in full: 230 V alone does not.
    const r = search([motor({ volts: '230' })], { ...failed, supplyVolts: null });
    expect(r.refused[0]!.reasons[0]!.text).toBe('Rated 230 V; the old motor ran on 208–230 V. Measure the supply to match on it alone.');
  });

  it('refuses a motor rated for more amps than the old one, saying why', () => {
    const hungry = motor({ fla: 3.4 });
    expect(reasonsOf(search([hungry]), hungry)).toEqual(["amps: Rated 3.4 A, above the old motor's 2.8 A that the circuit and its protection were sized for."]);
  });

  it('refuses too few speeds, another horsepower, another use and an empty bin, each saying why', () => {
    const oneSpeed = motor({ speeds: 1 });
    const bigger = motor({ horsepower: '1/2', taps: [{ horsepower: '1/2', microfarads: 10 }] });
    const condenser = motor({ application: 'condenser_fan' });
    const empty = motor({}, MY_TRUCK, 0);
    const r = search([oneSpeed, bigger, condenser, empty]);
    expect(r.fits).toEqual([]);
    expect(reasonsOf(r, oneSpeed)).toEqual(['speeds: 1 speed; the system uses 2.']);
    expect(reasonsOf(r, bigger)).toEqual(['horsepower: 1/2 hp; the old motor is 1/3 hp.']);
    expect(reasonsOf(r, condenser)).toEqual(['application: Made for a condenser fan, not an indoor blower.']);
    expect(reasonsOf(r, empty)).toEqual(['stock: None left at Truck 1.']);
  });

  it('lists this truck first, then other trucks, then the shop, then parts to order', () => {
    const atShop = motor({}, SHOP);
    const toOrder = motor({}, null, 0);
    const onOther = motor({}, OTHER_TRUCK);
    const onMine = motor({});
    const r = search([atShop, toOrder, onOther, onMine]);
    expect(r.fits.map((f) => f.place)).toEqual(['this_truck', 'other_truck', 'shop', 'order']);
    expect(r.fits[3]!.needs[0]).toBe('Not stocked anywhere: order it and book a visit to fit it.');
  });

  it('maps the old taps onto a motor with more speeds and warns about shaft and frame differences', () => {
    const fiveSpeed = motor({ speeds: 5, shaft: { diameterIn: 0.3125, lengthIn: 3.5 }, frame: '42' });
    const fit = search([fiveSpeed], { ...failed, tapsInUse: ['medium', 'low'] }).fits[0]!;
    expect(fit.needs).toContain('Speed taps: use the same taps as the old motor (medium and low); tape off the unused high, medium-high and medium-low leads.');
    // Old 3-speed high and medium on a 4-speed: medium sits halfway down, which lands on medium-low.
    const fourSpeed = motor({ speeds: 4 });
    expect(search([fourSpeed], { ...failed, tapsInUse: ['high', 'medium'] }).fits[0]!.needs).toContain(
      'Speed taps: old high → high, old medium → medium-low; tape off the unused medium-high and low leads.',
    );
    // Taps not noted: the wiring is said in general.
    expect(search([fourSpeed], { ...failed, tapsInUse: [] }).fits[0]!.needs).toContain(
      "Speed taps: wire the 2 calls to the taps that match the old motor's (the highest stays on high), and tape off the 2 unused leads.",
    );
    expect(fit.needs).toContain('Fit a shaft bushing: the wheel hub is bored for the larger old shaft.');
    expect(fit.needs).toContain("Check that the wheel's set screw still lands on the shorter shaft's flat.");
    expect(fit.differs.map((d) => d.field)).toEqual(['speeds', 'shaft', 'frame']);
  });

  it('leaves out other categories and lists parts without a spec as not matchable', () => {
    const bare: PartCandidate = { itemId: 'x', sku: 'MTR-X', name: 'Motor, spec not entered', spec: null, location: MY_TRUCK, quantity: 3 };
    const r = search([cap({}), bare]);
    expect(r.fits).toEqual([]);
    expect(r.refused.map((x) => x.candidate)).toEqual([bare]);
    expect(r.refused[0]!.reasons[0]!.field).toBe('spec');
  });
});

describe('finding a replacement capacitor', () => {
  const dual = failedCapacitorSchema.parse({ category: 'capacitor', microfarads: '40/5', volts: 370, shape: 'round' });

  it('fits the same µF and voltage, and a higher voltage rating, and notes a different shape', () => {
    const same = cap({ microfarads: '40/5' });
    const higher = cap({ microfarads: '40/5', volts: 440, shape: 'oval' }, SHOP);
    const r = search([higher, same], dual);
    expect(r.fits.map((f) => f.candidate)).toEqual([same, higher]);
    expect(r.fits[0]!.differs).toEqual([]);
    expect(r.fits[0]!.needs).toEqual(['Move the wires terminal for terminal: HERM to the compressor, FAN to the fan motor, C to common.']);
    // 370 → 440 V is fine (common practice); the shape is a fit note, not a refusal.
    expect(r.fits[1]!.matches.find((m) => m.field === 'volts')!.text).toBe('440 V, above the old 370 V: fine.');
    expect(r.fits[1]!.differs).toEqual([{ field: 'shape', text: 'Oval; the old one is round.' }]);
    expect(r.fits[1]!.needs).toContain('Check that the oval can fits the bracket, or strap it.');
  });

  it('accepts µF within the printed tolerance and refuses beyond it', () => {
    // ±6 % of 40 µF is 2.4 µF: 42 µF (5 %) fits, 45 µF (12.5 %) does not.
    const near = cap({ microfarads: '42/5' });
    const far = cap({ microfarads: '45/5' });
    const r = search([near, far], dual);
    expect(r.fits.map((f) => f.candidate)).toEqual([near]);
    expect(r.fits[0]!.differs[0]!.text).toBe('42/5 µF against the old 40/5 µF: within ±6 %.');
    expect(reasonsOf(r, far)).toEqual(['microfarads: HERM 45 µF is more than ±6 % from the old 40 µF.']);
    // On a ±5 % can, 42 µF is exactly 5 % off and still fits; 42.5 µF (6.25 %) does not.
    const tight = { ...dual, tolerancePct: 5 };
    expect(search([cap({ microfarads: '42/5' })], tight).fits).toHaveLength(1);
    expect(search([cap({ microfarads: '42.5/5' })], tight).fits).toHaveLength(0);
  });

  it('refuses a lower voltage rating: 440 V → 370 V', () => {
    const f440 = failedCapacitorSchema.parse({ category: 'capacitor', microfarads: '7.5', volts: 440, shape: 'oval' });
    const low = cap({ volts: 370 });
    expect(reasonsOf(search([low], f440), low)).toEqual(["volts: 370 V, below the old capacitor's 440 V."]);
  });

  it('refuses a single can for a dual one, pointing to two singles', () => {
    const single = cap({ microfarads: '40' });
    expect(reasonsOf(search([single], dual), single)![0]).toBe(
      'microfarads: A single 40 µF can; the old one is a dual 40/5 µF. Two single capacitors can stand in for it: search for each section.',
    );
  });
});
