import { priceBookItemInputSchema, type PriceBookItemInput } from '../../../shared/schemas/pricebook';
import type { Tx } from '../client';
import * as t from '../schema';
import { insertItem } from '../../pricebook/pricebook.service';

// The demo price book (invented part numbers and prices), flat-rate tasks, and stocked trucks.
// No random draws, so the rest of the demo stays as it was.

type Raw = Omit<PriceBookItemInput, 'unit' | 'partsWarrantyMonths' | 'spec' | 'active' | 'costCents'> & {
  unit?: PriceBookItemInput['unit'];
  partsWarrantyMonths?: number;
  spec?: unknown;
  costCents?: number;
};

const motor = (
  sku: string,
  name: string,
  hp: string,
  volts: string,
  rpm: number,
  speeds: number,
  rotation: string,
  fla: number,
  taps: { horsepower: string; microfarads: number }[],
  cents: number,
  application = 'indoor_blower',
): Raw => ({
  sku,
  name,
  kind: 'part',
  category: 'motor',
  unitCents: cents,
  costCents: Math.round(cents * 0.45),
  taxable: true,
  partsWarrantyMonths: 12,
  spec: {
    category: 'motor',
    application,
    horsepower: hp,
    volts,
    phase: 1,
    rpm,
    speeds,
    rotation,
    rotationViewedFrom: rotation === 'reversible' ? null : 'shaft_end',
    shaft: { diameterIn: 0.5, lengthIn: 5 },
    frame: '48',
    fla,
    taps,
    capacitorVolts: taps.length ? 370 : null,
  },
});
const cap = (uf: string, volts: number, shape: 'round' | 'oval', cents: number): Raw => ({
  sku: `CAP-${uf.replace('/', '-')}-${volts}-${shape === 'round' ? 'R' : 'O'}`,
  name: `Run capacitor ${uf} µF ${volts} V ${shape}`,
  kind: 'part',
  category: 'capacitor',
  unitCents: cents,
  costCents: Math.round(cents * 0.3),
  taxable: true,
  partsWarrantyMonths: 12,
  spec: { category: 'capacitor', microfarads: uf, volts, shape },
});
const plain = (sku: string, name: string, kind: 'labor' | 'fee', category: PriceBookItemInput['category'], cents: number, unit: PriceBookItemInput['unit'] = 'each'): Raw => ({
  sku,
  name,
  kind,
  category,
  unitCents: cents,
  taxable: false,
  unit,
});

export const DEMO_BLOWER_MOTOR_SKU = 'MTR-BLW-050-115-4S';
export const DEMO_BLOWER_CAPACITOR_SKU = 'CAP-10-370-R';

export const DEMO_ITEMS: Raw[] = [
  motor(DEMO_BLOWER_MOTOR_SKU, 'Indoor blower motor 1/2 hp 115 V 1075 RPM 4-speed', '1/2', '115', 1075, 4, 'reversible', 7.0, [{ horsepower: '1/2', microfarads: 10 }], 28900),
  motor(
    'MTR-BLW-MHP-230-4S',
    'Indoor blower motor 1/3–3/4 hp 208-230 V 1075 RPM 4-speed',
    '1/3-3/4',
    '208-230',
    1075,
    4,
    'reversible',
    5.2,
    [
      { horsepower: '1/3', microfarads: 5 },
      { horsepower: '1/2', microfarads: 7.5 },
      { horsepower: '3/4', microfarads: 10 },
    ],
    34900,
  ),
  motor('MTR-BLW-033-115-3S', 'Indoor blower motor 1/3 hp 115 V 1075 RPM 3-speed', '1/3', '115', 1075, 3, 'reversible', 5.0, [{ horsepower: '1/3', microfarads: 7.5 }], 24900),
  motor(
    'MTR-BLW-075-230-4S',
    'Indoor blower motor 3/4 hp 208-230 V 1075 RPM 4-speed',
    '3/4',
    '208-230',
    1075,
    4,
    'reversible',
    4.6,
    [{ horsepower: '3/4', microfarads: 15 }],
    39900,
  ),
  motor(
    'MTR-BLW-050-230-1625',
    'Indoor blower motor 1/2 hp 208-230 V 1625 RPM 3-speed',
    '1/2',
    '208-230',
    1625,
    3,
    'reversible',
    3.3,
    [{ horsepower: '1/2', microfarads: 7.5 }],
    31900,
  ),
  motor(
    'MTR-CFM-025-230-CCW',
    'Condenser fan motor 1/4 hp 208-230 V 1075 RPM CCW',
    '1/4',
    '208-230',
    1075,
    1,
    'ccw',
    1.8,
    [{ horsepower: '1/4', microfarads: 5 }],
    18900,
    'condenser_fan',
  ),
  motor(
    'MTR-CFM-033-230-CW',
    'Condenser fan motor 1/3 hp 208-230 V 825 RPM CW',
    '1/3',
    '208-230',
    825,
    1,
    'cw',
    2.4,
    [{ horsepower: '1/3', microfarads: 5 }],
    21900,
    'condenser_fan',
  ),
  motor(
    'MTR-CFM-MHP-230-REV',
    'Condenser fan motor 1/6–1/2 hp 208-230 V 1075 RPM',
    '1/6-1/2',
    '208-230',
    1075,
    1,
    'reversible',
    3.0,
    [
      { horsepower: '1/6', microfarads: 3 },
      { horsepower: '1/4', microfarads: 5 },
      { horsepower: '1/3', microfarads: 5 },
      { horsepower: '1/2', microfarads: 7.5 },
    ],
    24900,
    'condenser_fan',
  ),
  ...(['5', '7.5', '10', '15'] as const).map((uf, i) => cap(uf, 370, 'round', 2400 + i * 300)),
  ...(['5', '10'] as const).map((uf, i) => cap(uf, 440, 'oval', 2900 + i * 300)),
  ...(['35/5', '40/5', '45/5', '55/5'] as const).map((uf, i) => cap(uf, 440, 'round', 5900 + i * 400)),
  ...(['40/5', '45/5'] as const).map((uf, i) => cap(uf, 440, 'oval', 6400 + i * 400)),
  ...(
    [
      [1, 24, 30],
      [2, 24, 30],
      [2, 24, 40],
      [3, 24, 40],
    ] as const
  ).map(([poles, coil, fla]) => ({
    sku: `CTR-${poles}P-${coil}V-${fla}A`,
    name: `Contactor ${poles}-pole ${coil} V coil ${fla} A`,
    kind: 'part' as const,
    category: 'contactor' as const,
    unitCents: 4500 + poles * 1200,
    costCents: 1500 + poles * 400,
    taxable: true,
    partsWarrantyMonths: 12,
    spec: { category: 'contactor', poles, coilVolts: coil, fla },
  })),
  ...(['16x25x1', '20x25x1', '16x20x1', '20x20x1', '16x25x4', '20x25x4'] as const).map((size) => ({
    sku: `FLT-${size.toUpperCase()}-M${size.endsWith('4') ? 11 : 8}`,
    name: `Pleated filter ${size} MERV ${size.endsWith('4') ? 11 : 8}`,
    kind: 'part' as const,
    category: 'filter' as const,
    unitCents: size.endsWith('4') ? 4200 : 1600,
    costCents: size.endsWith('4') ? 1800 : 500,
    taxable: true,
    spec: { category: 'filter', size, merv: size.endsWith('4') ? 11 : 8 },
  })),
  {
    sku: 'REF-R410A-LB',
    name: 'Refrigerant R-410A (per lb)',
    kind: 'part',
    category: 'refrigerant',
    unit: 'lb',
    unitCents: 9500,
    costCents: 2200,
    taxable: true,
    spec: { category: 'refrigerant', refrigerant: 'R-410A' },
  },
  {
    sku: 'REF-R454B-LB',
    name: 'Refrigerant R-454B (per lb)',
    kind: 'part',
    category: 'refrigerant',
    unit: 'lb',
    unitCents: 11500,
    costCents: 3100,
    taxable: true,
    spec: { category: 'refrigerant', refrigerant: 'R-454B' },
  },
  {
    sku: 'REF-R32-LB',
    name: 'Refrigerant R-32 (per lb)',
    kind: 'part',
    category: 'refrigerant',
    unit: 'lb',
    unitCents: 10500,
    costCents: 2600,
    taxable: true,
    spec: { category: 'refrigerant', refrigerant: 'R-32' },
  },
  {
    sku: 'IGN-HSI-80V',
    name: 'Hot-surface igniter, 80 V',
    kind: 'part',
    category: 'igniter',
    unitCents: 14900,
    costCents: 3800,
    taxable: true,
    partsWarrantyMonths: 12,
    spec: { category: 'igniter', notes: '' },
  },
  {
    sku: 'FLS-ROD-STD',
    name: 'Flame sensor rod',
    kind: 'part',
    category: 'flame_sensor',
    unitCents: 8900,
    costCents: 1500,
    taxable: true,
    partsWarrantyMonths: 12,
    spec: { category: 'flame_sensor', notes: '' },
  },
  {
    sku: 'PSW-050WC',
    name: 'Draft pressure switch 0.50 in. w.c.',
    kind: 'part',
    category: 'pressure_switch',
    unitCents: 11900,
    costCents: 3200,
    taxable: true,
    partsWarrantyMonths: 12,
    spec: { category: 'pressure_switch', notes: '' },
  },
  {
    sku: 'BRD-FURN-UNIV',
    name: 'Universal furnace control board',
    kind: 'part',
    category: 'control_board',
    unitCents: 38900,
    costCents: 12900,
    taxable: true,
    partsWarrantyMonths: 12,
    spec: { category: 'control_board', notes: '' },
  },
  {
    sku: 'TST-PROG-7DAY',
    name: 'Programmable thermostat, 7-day',
    kind: 'part',
    category: 'thermostat',
    unitCents: 17900,
    costCents: 6200,
    taxable: true,
    partsWarrantyMonths: 24,
    spec: { category: 'thermostat', notes: '' },
  },
  {
    sku: 'RLY-FAN-24V',
    name: 'Fan relay, 24 V coil',
    kind: 'part',
    category: 'relay',
    unitCents: 5900,
    costCents: 1400,
    taxable: true,
    partsWarrantyMonths: 12,
    spec: { category: 'relay', notes: '' },
  },
  {
    sku: 'CON-COIL-CLEANER',
    name: 'Coil cleaner, per application',
    kind: 'part',
    category: 'consumable',
    unitCents: 2500,
    costCents: 600,
    taxable: true,
    spec: { category: 'consumable', notes: '' },
  },
  {
    sku: 'CON-DRAIN-TABS',
    name: 'Condensate drain tablets',
    kind: 'part',
    category: 'consumable',
    unitCents: 1200,
    costCents: 300,
    taxable: true,
    spec: { category: 'consumable', notes: '' },
  },
  plain('LAB-REPAIR-HR', 'Repair labor, per hour', 'labor', 'repair_labor', 12500, 'hour'),
  plain('LAB-REPAIR-MOTOR', 'Labor to replace a blower motor', 'labor', 'repair_labor', 18500),
  plain('LAB-REPAIR-CAP', 'Labor to replace a run capacitor', 'labor', 'repair_labor', 6500),
  plain('LAB-REPAIR-CTR', 'Labor to replace a contactor', 'labor', 'repair_labor', 7500),
  plain('LAB-MAINT-HR', 'Maintenance labor, per hour', 'labor', 'maintenance_labor', 9500, 'hour'),
  plain('LAB-INSTALL-HR', 'Installation labor, per hour', 'labor', 'install_labor', 13500, 'hour'),
  plain('LAB-LEAK-SEARCH', 'Refrigerant leak search', 'labor', 'repair_labor', 22500),
  plain('FEE-DIAG', 'Diagnostic fee', 'fee', 'diagnostic_fee', 8900),
  plain('FEE-TUNEUP-COOL', 'Cooling tune-up', 'fee', 'tune_up', 12900),
  plain('FEE-TUNEUP-HEAT', 'Heating tune-up', 'fee', 'tune_up', 12900),
  plain('FEE-TRIP', 'Trip charge', 'fee', 'trip_fee', 4900),
  plain('FEE-AFTER-HOURS', 'After-hours call', 'fee', 'after_hours', 9900),
  plain('FEE-PERMIT', 'Permit filing', 'fee', 'permit', 7500),
  plain('FEE-DISPOSAL', 'Old equipment disposal', 'fee', 'disposal', 6000),
];

const TASKS = [
  {
    sku: 'TASK-CAP-10',
    name: 'Replace run capacitor (10 µF)',
    components: [
      [DEMO_BLOWER_CAPACITOR_SKU, 1],
      ['LAB-REPAIR-CAP', 1],
    ],
  },
  {
    sku: 'TASK-BLOWER-050',
    name: 'Replace indoor blower motor (1/2 hp) and its capacitor',
    components: [
      [DEMO_BLOWER_MOTOR_SKU, 1],
      [DEMO_BLOWER_CAPACITOR_SKU, 1],
      ['LAB-REPAIR-MOTOR', 1],
    ],
  },
  {
    sku: 'TASK-CTR-2P',
    name: 'Replace contactor (2-pole)',
    components: [
      ['CTR-2P-24V-30A', 1],
      ['LAB-REPAIR-CTR', 1],
    ],
  },
  {
    sku: 'TASK-DUAL-CAP-45',
    name: 'Replace dual run capacitor (45/5)',
    components: [
      ['CAP-45-5-440-R', 1],
      ['LAB-REPAIR-CAP', 1],
    ],
  },
] as const;

/** Truck stock per technician (index into the seeded technicians) and the shop: [sku, quantity, minimum]. */
const TRUCK_STOCK: [string, number, number][] = [
  [DEMO_BLOWER_MOTOR_SKU, 1, 1],
  [DEMO_BLOWER_CAPACITOR_SKU, 1, 2],
  ['CAP-7.5-370-R', 2, 2],
  ['CAP-5-370-R', 3, 2],
  ['CAP-45-5-440-R', 2, 2],
  ['CAP-40-5-440-R', 1, 2],
  ['CTR-2P-24V-30A', 2, 1],
  ['FLT-16X25X1-M8', 6, 4],
  ['REF-R410A-LB', 10, 5],
  ['MTR-CFM-MHP-230-REV', 1, 1],
];
const SHOP_STOCK: [string, number, number][] = [
  [DEMO_BLOWER_MOTOR_SKU, 2, 1],
  ['MTR-BLW-MHP-230-4S', 3, 1],
  ['MTR-BLW-075-230-4S', 1, 1],
  [DEMO_BLOWER_CAPACITOR_SKU, 8, 4],
  ['CAP-15-370-R', 4, 2],
  ['CAP-55-5-440-R', 2, 2],
  ['CTR-3P-24V-40A', 1, 1],
  ['FLT-20X25X4-M11', 10, 6],
  ['BRD-FURN-UNIV', 1, 1],
  ['IGN-HSI-80V', 0, 2],
];

export async function seedPriceBook(tx: Tx, technicians: { id: string; truck: string }[]): Promise<void> {
  const ids = new Map<string, string>();
  for (const raw of DEMO_ITEMS) {
    const row = await insertItem(tx, priceBookItemInputSchema.parse({ costCents: Math.round(raw.unitCents * 0.4), ...raw }));
    ids.set(row.sku, row.id);
  }
  for (const task of TASKS) {
    const [tr] = await tx.insert(t.flatRateTasks).values({ sku: task.sku, name: task.name }).returning({ id: t.flatRateTasks.id });
    await tx.insert(t.flatRateTaskLines).values(task.components.map(([sku, q], i) => ({ taskId: tr!.id, itemId: ids.get(sku)!, quantity: q, position: i + 1 })));
  }
  const place = async (locationId: string, rows: [string, number, number][]) =>
    tx.insert(t.stockLevels).values(rows.map(([sku, quantity, minimum]) => ({ locationId, itemId: ids.get(sku)!, quantity, minimum })));
  for (const [i, tech] of technicians.entries()) {
    const [loc] = await tx
      .insert(t.stockLocations)
      .values({ kind: 'truck', name: tech.truck || `Truck ${i + 1}`, technicianId: tech.id })
      .returning({ id: t.stockLocations.id });
    // Later trucks carry one fewer of each, so the restock list has work.
    await place(
      loc!.id,
      TRUCK_STOCK.map(([s, q, m]) => [s, Math.max(q - i, 0), m]),
    );
  }
  const [shop] = await tx.insert(t.stockLocations).values({ kind: 'shop', name: 'Shop' }).returning({ id: t.stockLocations.id });
  await place(shop!.id, SHOP_STOCK);
}
