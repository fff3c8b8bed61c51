import { COMPRESSOR_TYPES, type CompressorType } from '../equipment';
import { ReadingInputError, requireNonNegative, requirePositive } from './errors';

export { COMPRESSOR_TYPES, type CompressorType };

/** What the screen says when a variable-speed unit is not at its forced full capacity. */
export const FULL_CAPACITY_TEST_PROMPT = 'put the system in its full-capacity test mode to judge the charge';

/**
 * Percent of full capacity from the compressor frequency and the model's maximum. An inverter
 * compressor's displacement, and so roughly its capacity, is in proportion to its speed (common
 * practice; the maker's tables give the exact curve).
 */
export function capacityPctFromFrequency(i: { compressorHz: number; maxCompressorHz: number }): number {
  const hz = requireNonNegative('compressorHz', i.compressorHz);
  const max = requirePositive('maxCompressorHz', i.maxCompressorHz);
  if (hz > max) throw new ReadingInputError('compressorHz', `${hz} Hz is above the model's maximum of ${max} Hz`);
  return (100 * hz) / max;
}

export interface CapacityState {
  compressorType: CompressorType | null;
  /** Percent of full capacity the readings were taken at; null when it cannot be told. */
  pct: number | null;
  /** Worked out from frequency and maximum, rather than entered. */
  pctFromFrequency: boolean;
  forcedFull: boolean;
  /** Whether superheat and subcooling may be judged at all. */
  judgeCharge: boolean;
}

/**
 * The capacity the readings were taken at. A fixed-speed unit (or one of unrecorded type) runs at
 * 100 %. A variable-speed unit counts as full only when forced there by its test or charge mode;
 * its charge is judged only then.
 */
export function capacityState(r: {
  compressorType?: CompressorType;
  maxCompressorHz?: number;
  compressorHz?: number;
  capacityPct?: number;
  fullCapacityTest?: boolean;
}): CapacityState {
  const type = r.compressorType ?? null;
  const forcedFull = r.fullCapacityTest === true;
  if (type === null || type === 'fixed_speed') return { compressorType: type, pct: 100, pctFromFrequency: false, forcedFull, judgeCharge: true };
  if (forcedFull) return { compressorType: type, pct: 100, pctFromFrequency: false, forcedFull, judgeCharge: true };
  let pct: number | null = r.capacityPct ?? null;
  let fromFrequency = false;
  if (pct === null && r.compressorHz !== undefined && r.maxCompressorHz !== undefined) {
    pct = capacityPctFromFrequency({ compressorHz: r.compressorHz, maxCompressorHz: r.maxCompressorHz });
    fromFrequency = true;
  }
  // A two-stage unit with no stage recorded is taken at its high stage, where it is tested.
  if (type === 'two_stage' && pct === null) pct = 100;
  return { compressorType: type, pct, pctFromFrequency: fromFrequency, forcedFull, judgeCharge: type !== 'variable_speed' };
}
