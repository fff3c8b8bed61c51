import * as z from 'zod';
import { COMPRESSOR_TYPES } from '../equipment';
import { AIRFLOW_BASES } from './airflow';
import { REFRIGERANTS, PERFECT_VACUUM_PSIG } from './refrigerants';

const num = (label: string) => z.number({ error: `${label} must be a finite number` });
const tempF = (label: string) => num(label).min(-148, `${label} must be at least -148 °F`).max(392, `${label} must be at most 392 °F`);
const pressurePsig = (label: string) => num(label).min(PERFECT_VACUUM_PSIG, `${label} cannot be below a perfect vacuum (${PERFECT_VACUUM_PSIG} psig)`);
const positive = (label: string) => num(label).gt(0, `${label} must be greater than 0`);
const nonNegative = (label: string) => num(label).min(0, `${label} must not be negative`);

const bandF = (label: string) =>
  z.strictObject({ min: tempF(`${label} min`), max: tempF(`${label} max`) }).refine((b) => b.min <= b.max, { message: `${label} min must not exceed max`, path: ['max'] });

/**
 * One run capacitor, or one section of a dual capacitor (enter a dual part as its
 * compressor and outdoor fan sections). Measure µF directly, or give the current
 * through it and the voltage across it under load.
 */
export const capacitorReadingSchema = z.strictObject({
  ratedUf: positive('Rated µF').optional(),
  tolerancePct: positive('Tolerance').max(20, 'Tolerance must be at most 20 %').optional(),
  measuredUf: nonNegative('Measured µF').optional(),
  measuredAmps: nonNegative('Capacitor current').optional(),
  measuredVolts: positive('Capacitor voltage').optional(),
  frequencyHz: positive('Frequency').optional(),
});
export type CapacitorReading = z.infer<typeof capacitorReadingSchema>;

export const CAPACITOR_POSITIONS = ['compressor', 'outdoorFan', 'blower'] as const;
export type CapacitorPosition = (typeof CAPACITOR_POSITIONS)[number];

const shape = {
  mode: z.enum(['cooling', 'heating']).optional(),
  altitudeFt: num('Altitude').min(-1500, 'Altitude must be at least -1500 ft').max(16000, 'Altitude must be at most 16000 ft').optional(),

  returnDryBulbF: tempF('Return dry bulb').optional(),
  supplyDryBulbF: tempF('Supply dry bulb').optional(),
  returnRelativeHumidityPct: num('Return relative humidity')
    .min(0, 'Return relative humidity must be at least 0 %')
    .max(100, 'Return relative humidity must be at most 100 %')
    .optional(),
  /** Return-air wet bulb; computed from return dry bulb and RH when left out. */
  indoorWetBulbF: tempF('Indoor wet bulb').optional(),
  outdoorDryBulbF: tempF('Outdoor dry bulb').optional(),

  refrigerant: z.enum(REFRIGERANTS, { error: `Refrigerant must be one of ${REFRIGERANTS.join(', ')}` }).optional(),
  meteringDevice: z.enum(['fixed', 'txv', 'eev']).optional(),
  suctionPressurePsig: pressurePsig('Suction pressure').optional(),
  suctionLineTempF: tempF('Suction line temperature').optional(),
  liquidPressurePsig: pressurePsig('Liquid pressure').optional(),
  liquidLineTempF: tempF('Liquid line temperature').optional(),
  manufacturerSuperheatRangeF: bandF('Manufacturer superheat range').optional(),
  subcoolingTargetF: num('Subcooling target').min(0, 'Subcooling target must not be negative').max(40, 'Subcooling target must be at most 40 °F').optional(),

  capacitors: z
    .strictObject({
      compressor: capacitorReadingSchema.optional(),
      outdoorFan: capacitorReadingSchema.optional(),
      blower: capacitorReadingSchema.optional(),
    })
    .optional(),

  compressorAmps: nonNegative('Compressor amps').optional(),
  compressorRatedLoadAmps: positive('Compressor rated load amps').optional(),
  outdoorFanAmps: nonNegative('Outdoor fan amps').optional(),
  outdoorFanFullLoadAmps: positive('Outdoor fan full load amps').optional(),
  blowerAmps: nonNegative('Blower amps').optional(),
  blowerFullLoadAmps: positive('Blower full load amps').optional(),

  controlVoltageVac: nonNegative('Control voltage').optional(),
  airflowCfm: nonNegative('Airflow').optional(),
  /** Whether airflowCfm is standard CFM (blower tables) or actual CFM at the home's elevation (flow hood); standard when left out. */
  airflowBasis: z.enum(AIRFLOW_BASES, { error: `Airflow basis must be one of ${AIRFLOW_BASES.join(', ')}` }).optional(),
  nominalTons: positive('Nominal tons').max(60, 'Nominal tons must be at most 60').optional(),

  /** Total external static pressure across the blower cabinet, in. w.c. */
  totalExternalStaticInWc: nonNegative('Total external static pressure').max(5, 'Total external static pressure must be at most 5 in. w.c.').optional(),
  /** Nameplate or blower-table maximum external static pressure, in. w.c. */
  maxExternalStaticInWc: positive('Maximum external static pressure').max(2, 'Maximum external static pressure must be at most 2 in. w.c.').optional(),

  /** Carbon monoxide in the flue products, corrected to air-free, ppm. */
  flueCoAirFreePpm: nonNegative('Flue CO air-free').max(20000, 'Flue CO air-free must be at most 20000 ppm').optional(),
  /** Carbon monoxide in the living space, ppm. */
  ambientCoPpm: nonNegative('Living-space CO').max(2000, 'Living-space CO must be at most 2000 ppm').optional(),

  /** From the equipment record: how the compressor's capacity is controlled. */
  compressorType: z.enum(COMPRESSOR_TYPES, { error: `Compressor type must be one of ${COMPRESSOR_TYPES.join(', ')}` }).optional(),
  /** From the equipment record: a variable-speed unit's maximum compressor frequency, Hz. */
  maxCompressorHz: positive('Maximum compressor frequency').max(300, 'Maximum compressor frequency must be at most 300 Hz').optional(),
  /** Compressor frequency while the readings were taken, Hz. */
  compressorHz: nonNegative('Compressor frequency').max(300, 'Compressor frequency must be at most 300 Hz').optional(),
  /** Percent of full capacity while the readings were taken, as the unit's display or the maker's tool shows it. */
  capacityPct: nonNegative('Percent of capacity').max(100, 'Percent of capacity must be at most 100 %').optional(),
  /** The unit was forced to full capacity (its "test" or "charge" mode) for these readings. */
  fullCapacityTest: z.boolean({ error: 'Full-capacity test must be true or false' }).optional(),

  /** Furnace rise; computed from supply minus return in heating when left out. */
  temperatureRiseF: nonNegative('Temperature rise').max(200, 'Temperature rise must be at most 200 °F').optional(),
  riseRangeF: bandF('Nameplate rise range').optional(),
};

function needs(ctx: z.RefinementCtx, v: Record<string, unknown>, a: string, b: string, label: string): void {
  if (v[a] !== undefined && v[b] === undefined) {
    ctx.addIssue({ code: 'custom', path: [b], message: `${label} is needed with ${a}` });
  }
}

export const visitReadingsSchema = z.strictObject(shape).superRefine((v, ctx) => {
  const mode = v.mode ?? 'cooling';
  if (v.returnDryBulbF !== undefined && v.supplyDryBulbF !== undefined) {
    if (mode === 'cooling' && v.supplyDryBulbF > v.returnDryBulbF) {
      ctx.addIssue({
        code: 'custom',
        path: ['supplyDryBulbF'],
        message: 'Supply air cannot be warmer than return air in cooling; check the probes or set mode to heating',
      });
    }
    if (mode === 'heating' && v.supplyDryBulbF < v.returnDryBulbF) {
      ctx.addIssue({
        code: 'custom',
        path: ['supplyDryBulbF'],
        message: 'Supply air cannot be cooler than return air in heating; check the probes or set mode to cooling',
      });
    }
  }
  if (v.indoorWetBulbF !== undefined && v.returnDryBulbF !== undefined && v.indoorWetBulbF > v.returnDryBulbF) {
    ctx.addIssue({ code: 'custom', path: ['indoorWetBulbF'], message: 'Indoor wet bulb cannot exceed the return dry bulb' });
  }
  const r = v as Record<string, unknown>;
  needs(ctx, r, 'suctionPressurePsig', 'suctionLineTempF', 'Suction line temperature');
  needs(ctx, r, 'suctionLineTempF', 'suctionPressurePsig', 'Suction pressure');
  needs(ctx, r, 'liquidPressurePsig', 'liquidLineTempF', 'Liquid line temperature');
  needs(ctx, r, 'liquidLineTempF', 'liquidPressurePsig', 'Liquid pressure');
  if ((v.suctionPressurePsig !== undefined || v.liquidPressurePsig !== undefined) && v.refrigerant === undefined) {
    ctx.addIssue({ code: 'custom', path: ['refrigerant'], message: 'Refrigerant is needed to read line pressures' });
  }
  if (v.compressorHz !== undefined && v.maxCompressorHz !== undefined && v.compressorHz > v.maxCompressorHz) {
    ctx.addIssue({ code: 'custom', path: ['compressorHz'], message: `Compressor frequency cannot be above the model's maximum of ${v.maxCompressorHz} Hz` });
  }
  if (v.compressorType !== undefined && v.compressorType !== 'variable_speed') {
    for (const key of ['maxCompressorHz', 'compressorHz'] as const) {
      if (v[key] !== undefined) ctx.addIssue({ code: 'custom', path: [key], message: 'Compressor frequency is for a variable-speed compressor' });
    }
  }
  for (const pos of ['compressor', 'outdoorFan', 'blower'] as const) {
    const c = v.capacitors?.[pos];
    if (c?.measuredAmps !== undefined && c.measuredVolts === undefined) {
      ctx.addIssue({ code: 'custom', path: ['capacitors', pos, 'measuredVolts'], message: 'Capacitor voltage is needed with its current' });
    }
    if (c?.measuredVolts !== undefined && c.measuredAmps === undefined) {
      ctx.addIssue({ code: 'custom', path: ['capacitors', pos, 'measuredAmps'], message: 'Capacitor current is needed with its voltage' });
    }
  }
});

/** Readings from one visit. Every field is optional; a check runs when its inputs are present. */
export type VisitReadings = z.infer<typeof visitReadingsSchema>;
