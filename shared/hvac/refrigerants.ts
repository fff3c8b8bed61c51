import { SATURATION_TABLE, type SaturationRows } from './data/saturation-table';
import { ReadingInputError, requireFinite } from './errors';
import { atmosphericPressurePsia } from './psychrometrics';

import { REFRIGERANTS, type Refrigerant } from './refrigerant-names';
export { REFRIGERANTS, A2L_REFRIGERANTS, HIGH_GLIDE_REFRIGERANTS, type Refrigerant } from './refrigerant-names';

/** Bubble point = saturated liquid (subcooling); dew point = saturated vapour (superheat). */
export type SaturationPoint = 'bubble' | 'dew';

/** Gauge pressure of a perfect vacuum against a 14.696 psia atmosphere. */
export const PERFECT_VACUUM_PSIG = -14.696;
/** Standard sea-level atmosphere, psia; the saturation table's gauge pressures are taken against it. */
export const SEA_LEVEL_PSIA = 14.696;

/**
 * A gauge reading taken at an altitude, restated against the sea-level atmosphere the table uses:
 * absolute = gauge + local atmosphere (ASHRAE standard atmosphere at the elevation).
 */
export function tableGaugePsig(gaugePsig: number, altitudeFt?: number, field = 'pressurePsig'): number {
  const p = requireFinite(field, gaugePsig);
  if (altitudeFt === undefined) return p;
  return p + atmosphericPressurePsia(altitudeFt) - SEA_LEVEL_PSIA;
}

function rowsFor(refrigerant: unknown, field = 'refrigerant'): SaturationRows {
  const rows = typeof refrigerant === 'string' && (REFRIGERANTS as readonly string[]).includes(refrigerant) ? SATURATION_TABLE[refrigerant] : undefined;
  if (!rows) {
    throw new ReadingInputError(field, `unknown refrigerant "${String(refrigerant)}"; expected one of ${REFRIGERANTS.join(', ')}`);
  }
  return rows;
}

function pressures(rows: SaturationRows, point: unknown): readonly number[] {
  if (point === 'bubble') return rows.bubblePsig;
  if (point === 'dew') return rows.dewPsig;
  throw new ReadingInputError('point', `must be "bubble" or "dew", got "${String(point)}"`);
}

/** Linear interpolation of ys at x over ascending xs; caller has checked x is in range. */
function interpolate(xs: readonly number[], ys: readonly number[], x: number): number {
  let lo = 0;
  let hi = xs.length - 1;
  while (hi - lo > 1) {
    const mid = (lo + hi) >> 1;
    if (xs[mid]! <= x) lo = mid;
    else hi = mid;
  }
  const x0 = xs[lo]!;
  const x1 = xs[hi]!;
  const y0 = ys[lo]!;
  const y1 = ys[hi]!;
  return x1 === x0 ? y0 : y0 + ((y1 - y0) * (x - x0)) / (x1 - x0);
}

export function saturationPressureAt(refrigerant: Refrigerant, temperatureF: number, point: SaturationPoint, field = 'temperatureF'): number {
  const rows = rowsFor(refrigerant);
  const ps = pressures(rows, point);
  const t = requireFinite(field, temperatureF);
  const min = rows.tempF[0]!;
  const max = rows.tempF[rows.tempF.length - 1]!;
  if (t < min || t > max) {
    throw new ReadingInputError(field, `${t} °F is outside the ${refrigerant} table (${min} to ${max} °F)`);
  }
  return interpolate(rows.tempF, ps, t);
}

export function saturationTemperatureAt(refrigerant: Refrigerant, pressurePsig: number, point: SaturationPoint, field = 'pressurePsig'): number {
  const rows = rowsFor(refrigerant);
  const ps = pressures(rows, point);
  const p = requireFinite(field, pressurePsig);
  if (p < PERFECT_VACUUM_PSIG) {
    throw new ReadingInputError(field, `${p} psig is below a perfect vacuum (${PERFECT_VACUUM_PSIG} psig)`);
  }
  const min = ps[0]!;
  const max = ps[ps.length - 1]!;
  if (p < min || p > max) {
    throw new ReadingInputError(field, `${p} psig is outside the ${refrigerant} ${point}-point table (${min} to ${max} psig)`);
  }
  // Pressure rises strictly with temperature, so the same table inverts.
  return interpolate(ps, rows.tempF, p);
}

/** Saturation pressure (psig) at a temperature, interpolated linearly in the table. */
export function saturationPressurePsig(refrigerant: Refrigerant, temperatureF: number, point: SaturationPoint): number {
  return saturationPressureAt(refrigerant, temperatureF, point);
}

/** Saturation temperature (°F) at a gauge pressure, interpolated linearly in the table. */
export function saturationTemperatureF(refrigerant: Refrigerant, pressurePsig: number, point: SaturationPoint): number {
  return saturationTemperatureAt(refrigerant, pressurePsig, point);
}

/**
 * Suction line temperature above the dew-point temperature at suction pressure. With the
 * elevation given, the gauge reading is first restated against the sea-level atmosphere.
 */
export function superheatF(i: { refrigerant: Refrigerant; suctionPressurePsig: number; suctionLineTempF: number; altitudeFt?: number }): number {
  const line = requireFinite('suctionLineTempF', i.suctionLineTempF);
  const p = tableGaugePsig(i.suctionPressurePsig, i.altitudeFt, 'suctionPressurePsig');
  return line - saturationTemperatureAt(i.refrigerant, p, 'dew', 'suctionPressurePsig');
}

/** Bubble-point temperature at liquid pressure above the liquid line temperature (elevation as for superheat). */
export function subcoolingF(i: { refrigerant: Refrigerant; liquidPressurePsig: number; liquidLineTempF: number; altitudeFt?: number }): number {
  const line = requireFinite('liquidLineTempF', i.liquidLineTempF);
  const p = tableGaugePsig(i.liquidPressurePsig, i.altitudeFt, 'liquidPressurePsig');
  return saturationTemperatureAt(i.refrigerant, p, 'bubble', 'liquidPressurePsig') - line;
}
