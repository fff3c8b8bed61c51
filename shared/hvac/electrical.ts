import { requireNonNegative, requirePositive } from './errors';

/** Usual tolerance printed on a run capacitor (common practice). */
export const RUN_CAPACITOR_DEFAULT_TOLERANCE_PCT = 6;
/** Nominal class 2 control circuit voltage. */
export const CONTROL_VOLTAGE_NOMINAL_VAC = 24;

/**
 * Run capacitor microfarads from the current through it and the voltage across it,
 * under load: C = I / (2π f V), i.e. 2652 × A ÷ V at 60 Hz.
 */
export function microfaradsFromCurrent(i: { amps: number; volts: number; hz?: number }): number {
  const amps = requireNonNegative('amps', i.amps);
  const volts = requirePositive('volts', i.volts);
  const hz = requirePositive('hz', i.hz ?? 60);
  return (1e6 * amps) / (2 * Math.PI * hz * volts);
}
