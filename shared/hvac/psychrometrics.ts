import psychrolib from 'psychrolib';
import { ReadingInputError, requireFinite } from './errors';

// psychrolib exports one shared instance whose unit system is global state;
// build our own so another caller switching it to SI cannot change our results.
const psy = new psychrolib.constructor();
psy.SetUnitSystem(psy.IP);

/** Range over which psychrolib's ASHRAE equations are valid, °F. */
const DRY_BULB_MIN_F = -148;
const DRY_BULB_MAX_F = 392;
/** Homes sit between about the Dead Sea shore and the highest towns. */
const ALTITUDE_MIN_FT = -1500;
const ALTITUDE_MAX_FT = 16000;

function dryBulb(field: string, v: number): number {
  const t = requireFinite(field, v);
  if (t < DRY_BULB_MIN_F || t > DRY_BULB_MAX_F) {
    throw new ReadingInputError(field, `${t} °F is outside ${DRY_BULB_MIN_F} to ${DRY_BULB_MAX_F} °F`);
  }
  return t;
}

function relHumFraction(field: string, pct: number): number {
  const rh = requireFinite(field, pct);
  if (rh < 0 || rh > 100) throw new ReadingInputError(field, `${rh} % must be between 0 and 100 %`);
  return rh / 100;
}

/** Standard-atmosphere barometric pressure at an altitude, psia (ASHRAE Fundamentals ch. 1). */
export function atmosphericPressurePsia(altitudeFt = 0, field = 'altitudeFt'): number {
  const z = requireFinite(field, altitudeFt);
  if (z < ALTITUDE_MIN_FT || z > ALTITUDE_MAX_FT) {
    throw new ReadingInputError(field, `${z} ft is outside ${ALTITUDE_MIN_FT} to ${ALTITUDE_MAX_FT} ft`);
  }
  return psy.GetStandardAtmPressure(z);
}

/** Sea-level standard atmosphere, psia (ASHRAE Fundamentals ch. 1). */
const SEA_LEVEL_PSIA = 14.696;

/**
 * Air density at the elevation over sea-level density at the same temperature: the pressure
 * ratio of the ASHRAE standard atmosphere (density is proportional to pressure, ideal gas).
 */
export function airDensityRatio(altitudeFt = 0): number {
  return atmosphericPressurePsia(altitudeFt) / SEA_LEVEL_PSIA;
}

/** Thermodynamic wet bulb from dry bulb and relative humidity. */
export function wetBulbF(i: { dryBulbF: number; relativeHumidityPct: number; altitudeFt?: number }): number {
  const t = dryBulb('dryBulbF', i.dryBulbF);
  const rh = relHumFraction('relativeHumidityPct', i.relativeHumidityPct);
  return psy.GetTWetBulbFromRelHum(t, rh, atmosphericPressurePsia(i.altitudeFt));
}

/** Dew point from dry bulb and relative humidity (independent of pressure). */
export function dewPointF(i: { dryBulbF: number; relativeHumidityPct: number }): number {
  const t = dryBulb('dryBulbF', i.dryBulbF);
  const rh = relHumFraction('relativeHumidityPct', i.relativeHumidityPct);
  // Bone-dry air has no dew point.
  if (rh === 0) throw new ReadingInputError('relativeHumidityPct', 'must be above 0 % to have a dew point');
  return psy.GetTDewPointFromRelHum(t, rh);
}

export interface MoistAirState {
  /** lb of water per lb of dry air */
  humidityRatio: number;
  relativeHumidityPct: number;
  dewPointF: number;
}

/** Moist-air state from a sling or probe reading of dry bulb and wet bulb. */
export function moistAirFromWetBulb(i: { dryBulbF: number; wetBulbF: number; altitudeFt?: number }): MoistAirState {
  const t = dryBulb('dryBulbF', i.dryBulbF);
  const wb = dryBulb('wetBulbF', i.wetBulbF);
  if (wb > t) throw new ReadingInputError('wetBulbF', `${wb} °F cannot exceed the dry bulb ${t} °F`);
  const p = atmosphericPressurePsia(i.altitudeFt);
  try {
    return {
      humidityRatio: psy.GetHumRatioFromTWetBulb(t, wb, p),
      relativeHumidityPct: psy.GetRelHumFromTWetBulb(t, wb, p) * 100,
      dewPointF: psy.GetTDewPointFromTWetBulb(t, wb, p),
    };
  } catch (e) {
    // Very low wet bulbs imply air drier than bone dry.
    throw new ReadingInputError('wetBulbF', `${wb} °F is too low for a dry bulb of ${t} °F (${(e as Error).message})`);
  }
}
