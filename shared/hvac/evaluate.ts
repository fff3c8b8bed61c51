import { AIRFLOW_CFM_PER_TON, BTUH_PER_TON, sensibleCapacityBtuh, sensibleHeatFactor, standardCfm } from './airflow';
import { FULL_CAPACITY_TEST_PROMPT, capacityState, type CapacityState } from './capacity';
import {
  EXPANSION_VALVE_ALERT_SUPERHEAT_F,
  EXPANSION_VALVE_DEFAULT_SUPERHEAT_F,
  FIXED_ORIFICE_CHART,
  FIXED_ORIFICE_MIN_TARGET_SUPERHEAT_F,
  FIXED_ORIFICE_TOLERANCE_F,
  MIN_SAFE_SUPERHEAT_F,
  SUBCOOLING_TOLERANCE_F,
  fixedOrificeTarget,
} from './charge';
import { CONTROL_VOLTAGE_NOMINAL_VAC, RUN_CAPACITOR_DEFAULT_TOLERANCE_PCT, microfaradsFromCurrent } from './electrical';
import { ReadingInputError } from './errors';
export { READING_HELP } from './reading-help';
import { CAPACITOR_POSITIONS, type CapacitorPosition, type VisitReadings, visitReadingsSchema } from './readings';
import { subcoolingF, superheatF } from './refrigerants';
import { SPLIT_TOLERANCE_F, TARGET_SPLIT_RANGE, returnWetBulbF, targetSplitF } from './split';

export { coolingSplitTargetF } from './split';

export type CheckStatus = 'ok' | 'watch' | 'alert';

export interface ReadingCheck {
  check: string;
  value: number;
  unit: string;
  expected: { min?: number; max?: number; target?: number };
  status: CheckStatus;
  message: string;
  source: string;
  /** A caution (by id, see cautions.ts) the screen shows beside this reading. */
  caution?: string;
}

/** The split's pass band around the table's target (Title 24 RA3.2, from memory). */
export const COOLING_SPLIT_F = { below: SPLIT_TOLERANCE_F, above: SPLIT_TOLERANCE_F } as const;
/** Outside-the-band margins that still rate 'watch' rather than 'alert' (our bands). */
const SPLIT_WATCH_MARGIN_F = 2;
const AIRFLOW_WATCH_MARGIN_CFM_PER_TON = 50;
/** Running amps above this share of nameplate rate 'watch' (common practice). */
const AMPS_WATCH_FRACTION = 0.9;
/**
 * Below this share of RLA (or this many amps with no RLA) a compressor that should run is not
 * running: off on its internal overload, an open contactor or a failed capacitor (common practice).
 */
const COMPRESSOR_NOT_RUNNING_FRACTION = 0.1;
const COMPRESSOR_NOT_RUNNING_A = 0.5;
const CONTROL_OK_FRACTION = 0.1;
const CONTROL_WATCH_FRACTION = 0.2;
/** Sensible share of nominal capacity (common practice: about 0.75 at normal indoor humidity). */
const SENSIBLE_SHARE = { min: 0.6, target: 0.75, max: 1, alertBelow: 0.5 } as const;
/** The usual residential maximum total external static pressure when no nameplate figure is entered (common practice). */
export const DEFAULT_MAX_EXTERNAL_STATIC_IN_WC = 0.5;
/** Above the maximum by this much still rates 'watch' (our band). */
const STATIC_WATCH_MARGIN_IN_WC = 0.1;
/**
 * Air-free CO in the flue. ANSI Z21.47/CSA 2.3 (gas-fired central furnaces) certifies a furnace
 * to at most 400 ppm air-free in its flue products: above it is hazardous. Above 100 ppm the
 * burner needs service (BPI-1200 combustion safety action level, from memory).
 */
export const FLUE_CO_AIR_FREE_PPM = { service: 100, hazard: 400 } as const;
/**
 * CO in the living space. The U.S. EPA's national ambient air quality standard for CO is 9 ppm over
 * 8 hours and 35 ppm over 1 hour: above 9 ppm look for the source; above 35 ppm it is hazardous.
 */
export const AMBIENT_CO_PPM = { investigate: 9, hazard: 35 } as const;

const round = (x: number, digits: number): number => {
  const f = 10 ** digits;
  const r = Math.round(x * f) / f;
  return Object.is(r, -0) ? 0 : r;
};
/** Bounds print without trailing zeros: 16–22, 14.5–20.5. */
const b = (x: number): string => String(round(x, 1));
const grouped = (x: number): string => Math.round(x).toLocaleString('en-US');

function rateBand(value: number, min: number, max: number, watchMargin = 0): CheckStatus {
  if (value >= min && value <= max) return 'ok';
  if (value >= min - watchMargin && value <= max + watchMargin) return 'watch';
  return 'alert';
}

const PART_LOAD_NEEDED = 'percent of capacity (or frequency and maximum) needed to judge it below full capacity';
const at = (c: CapacityState): string => (c.pct !== null && c.pct < 100 ? ` at ${Math.round(c.pct)} % of capacity` : '');

function splitCheck(r: VisitReadings, cap: CapacityState): ReadingCheck | null {
  if ((r.mode ?? 'cooling') !== 'cooling' || r.returnDryBulbF === undefined || r.supplyDryBulbF === undefined) return null;
  const value = round(r.returnDryBulbF - r.supplyDryBulbF, 1);
  const base = { check: 'temperature_split', value, unit: '°F' };
  const shown = `Split ${value.toFixed(1)} °F`;
  const tableSource = `Target temperature split by return dry bulb and wet bulb, ±${SPLIT_TOLERANCE_F} °F (Title 24 Reference Appendix RA3.2 temperature split method; table cells from memory, see data/README.md)`;
  const wb = returnWetBulbF({
    returnDryBulbF: r.returnDryBulbF,
    returnWetBulbF: r.indoorWetBulbF,
    returnRelativeHumidityPct: r.returnRelativeHumidityPct,
    altitudeFt: r.altitudeFt,
  });
  if (!wb) {
    return { ...base, expected: {}, status: 'watch', message: `${shown}; return wet bulb or RH needed for the target`, source: tableSource };
  }
  const wbNote = wb.computed ? '; return wet bulb computed from dry bulb and RH (ASHRAE Fundamentals psychrometrics via psychrolib)' : '';
  const target = targetSplitF({ returnDryBulbF: r.returnDryBulbF, returnWetBulbF: wb.wetBulbF });
  if (target === null) {
    const range = TARGET_SPLIT_RANGE;
    return {
      ...base,
      expected: {},
      status: 'watch',
      message: `${shown}; the split method does not apply at return ${b(r.returnDryBulbF)} °F DB, ${b(wb.wetBulbF)} °F WB (table covers ${range.returnDryBulbF.min}–${range.returnDryBulbF.max} °F DB, ${range.returnWetBulbF.min}–${range.returnWetBulbF.max} °F WB)`,
      source: `${tableSource}${wbNote}`,
    };
  }
  if (cap.pct === null) return { ...base, expected: {}, status: 'watch', message: `${shown}; ${PART_LOAD_NEEDED}`, source: `${tableSource}${wbNote}` };
  const t = round(target, 1);
  const share = cap.pct / 100;
  // At part capacity the split lies between target × share (blower at full speed) and the target (blower slowed in step).
  const min = round(t * share - SPLIT_TOLERANCE_F, 1);
  const max = round(t + SPLIT_TOLERANCE_F, 1);
  return {
    ...base,
    expected: { min, max, target: t },
    status: rateBand(value, min, max, SPLIT_WATCH_MARGIN_F),
    message: `${shown}, target ${b(min)}–${b(max)} °F${at(cap)} (return ${b(r.returnDryBulbF)} °F DB, ${b(wb.wetBulbF)} °F WB)`,
    source: `${tableSource}${wbNote}; ${SPLIT_WATCH_MARGIN_F} °F beyond the band is our watch margin${share < 1 ? '; below full capacity the low end scales with the percent of capacity (our method: sensible capacity in proportion)' : ''}`,
  };
}

function riseCheck(r: VisitReadings): ReadingCheck | null {
  let rise = r.temperatureRiseF;
  if (rise === undefined && r.mode === 'heating' && r.returnDryBulbF !== undefined && r.supplyDryBulbF !== undefined) {
    rise = r.supplyDryBulbF - r.returnDryBulbF;
  }
  if (rise === undefined) return null;
  const value = round(rise, 1);
  const range = r.riseRangeF;
  if (!range) {
    return {
      check: 'temperature_rise',
      value,
      unit: '°F',
      expected: {},
      status: 'watch',
      message: `Rise ${value.toFixed(1)} °F; nameplate rise range needed`,
      source: 'Furnace nameplate temperature rise range (not entered)',
    };
  }
  return {
    check: 'temperature_rise',
    value,
    unit: '°F',
    expected: { min: range.min, max: range.max },
    status: rateBand(value, range.min, range.max),
    message: `Rise ${value.toFixed(1)} °F, nameplate ${b(range.min)}–${b(range.max)} °F`,
    source: 'Furnace nameplate temperature rise range',
  };
}

function indoorWetBulb(r: VisitReadings): { wb: number; computed: boolean } | null {
  const wb = returnWetBulbF({
    returnDryBulbF: r.returnDryBulbF,
    returnWetBulbF: r.indoorWetBulbF,
    returnRelativeHumidityPct: r.returnRelativeHumidityPct,
    altitudeFt: r.altitudeFt,
  });
  return wb ? { wb: wb.wetBulbF, computed: wb.computed } : null;
}

const altitudeNote = (r: VisitReadings): string =>
  r.altitudeFt !== undefined ? `; gauge restated against sea level for ${grouped(r.altitudeFt)} ft (ASHRAE standard atmosphere via psychrolib)` : '';

/** Superheat under 5 °F alerts whatever the metering device or the capacity: the compressor is at risk. */
function floodbackCheck(base: { check: string; value: number; unit: string }, shown: string, device: string, r: VisitReadings): ReadingCheck {
  return {
    ...base,
    expected: { min: MIN_SAFE_SUPERHEAT_F },
    status: 'alert',
    message: `${shown}: under ${MIN_SAFE_SUPERHEAT_F} °F at the service port, liquid may be reaching the compressor${device}`,
    source: `Common practice: superheat under ${MIN_SAFE_SUPERHEAT_F} °F at the suction service port is an alert on every metering device (piston charging charts commonly state this floor)${altitudeNote(r)}`,
  };
}

function superheatCheck(r: VisitReadings, cap: CapacityState): ReadingCheck | null {
  if ((r.mode ?? 'cooling') !== 'cooling' || r.suctionPressurePsig === undefined || r.suctionLineTempF === undefined || !r.refrigerant) {
    return null;
  }
  const value = round(superheatF({ refrigerant: r.refrigerant, suctionPressurePsig: r.suctionPressurePsig, suctionLineTempF: r.suctionLineTempF, altitudeFt: r.altitudeFt }), 1);
  const base = { check: 'superheat', value, unit: '°F' };
  const shown = `Superheat ${value.toFixed(1)} °F`;
  const alt = altitudeNote(r);
  const device = r.meteringDevice ? ` (${r.meteringDevice === 'fixed' ? 'fixed orifice' : r.meteringDevice.toUpperCase()})` : '';

  if (value < MIN_SAFE_SUPERHEAT_F) return floodbackCheck(base, shown, device, r);
  if (!cap.judgeCharge) {
    return {
      ...base,
      expected: {},
      status: 'watch',
      message: `${shown}${at(cap)}; ${FULL_CAPACITY_TEST_PROMPT}`,
      source: `Variable-speed unit: charge is judged only at forced full capacity (common practice; the maker's test or charge mode)${alt}`,
    };
  }

  if (r.meteringDevice === 'txv' || r.meteringDevice === 'eev') {
    const valve = r.meteringDevice.toUpperCase();
    const given = r.manufacturerSuperheatRangeF;
    if (given) {
      return {
        ...base,
        expected: { min: given.min, max: given.max },
        status: rateBand(value, given.min, given.max),
        message: `${shown}, range ${b(given.min)}–${b(given.max)} °F (${valve})`,
        source: `Manufacturer's superheat range for this ${valve} system, as entered${alt}`,
      };
    }
    const { min, max } = EXPANSION_VALVE_DEFAULT_SUPERHEAT_F;
    const wide = EXPANSION_VALVE_ALERT_SUPERHEAT_F;
    // Off the usual band is a prompt to look up the manufacturer's figure; off the wide band is a fault.
    const status: CheckStatus = value >= min && value <= max ? 'ok' : value >= wide.min && value <= wide.max ? 'watch' : 'alert';
    return {
      ...base,
      expected: { min, max },
      status,
      message: `${shown}, range ${b(min)}–${b(max)} °F (${valve}, default)`,
      source: `Common practice: ${min}–${max} °F at a ${valve} when no manufacturer range is entered, outside it rates watch; outside ${wide.min}–${wide.max} °F is an alert (Title 24 Reference Appendix RA3.2 subcooling method, from memory)${alt}`,
    };
  }

  if (r.meteringDevice === 'fixed') {
    const fixedSource = `Fixed-orifice superheat charging method: target = ((3 × indoor WB) − 80 − outdoor DB) / 2 (common practice; service literature), ±${FIXED_ORIFICE_TOLERANCE_F} °F (Title 24 Reference Appendix RA3.2)`;
    const wb = indoorWetBulb(r);
    if (!wb || r.outdoorDryBulbF === undefined) {
      return {
        ...base,
        expected: {},
        status: 'watch',
        message: `${shown}; indoor wet bulb and outdoor dry bulb needed for the target`,
        source: `${fixedSource}${alt}`,
      };
    }
    const wbNote = wb.computed ? '; indoor WB computed from return dry bulb and RH (ASHRAE Fundamentals psychrometrics via psychrolib)' : '';
    const target = fixedOrificeTarget({ indoorWetBulbF: wb.wb, outdoorDryBulbF: r.outdoorDryBulbF });
    if (target.kind === 'outside_chart') {
      const c = FIXED_ORIFICE_CHART;
      return {
        ...base,
        expected: {},
        status: 'watch',
        message: `${shown}; the fixed-orifice method does not apply: ${target.reason}`,
        source: `${fixedSource}; the chart covers outdoor ${c.outdoorDryBulbF.min}–${c.outdoorDryBulbF.max} °F and indoor wet bulb ${c.indoorWetBulbF.min}–${c.indoorWetBulbF.max} °F (Title 24 RA3.2 target superheat table, from memory)${wbNote}${alt}`,
      };
    }
    if (target.kind === 'below_minimum') {
      return {
        ...base,
        expected: {},
        status: 'watch',
        message: `${shown}; target below ${FIXED_ORIFICE_MIN_TARGET_SUPERHEAT_F} °F, do not charge by superheat at these conditions`,
        source: `${fixedSource}; Title 24 RA3.2 does not verify charge where the target falls below ${FIXED_ORIFICE_MIN_TARGET_SUPERHEAT_F} °F${wbNote}${alt}`,
      };
    }
    const t = round(target.targetF, 1);
    const min = round(t - FIXED_ORIFICE_TOLERANCE_F, 1);
    const max = round(t + FIXED_ORIFICE_TOLERANCE_F, 1);
    return {
      ...base,
      expected: { min, max, target: t },
      status: rateBand(value, min, max),
      message: `${shown}, target ${t.toFixed(1)} °F ±${FIXED_ORIFICE_TOLERANCE_F} (fixed orifice)`,
      source: `${fixedSource}${wbNote}${alt}`,
    };
  }

  return {
    ...base,
    expected: {},
    status: 'watch',
    message: `${shown}; metering device needed to set the target`,
    source: `Target depends on the metering device: fixed-orifice method or TXV/EEV range${alt}`,
  };
}

function subcoolingCheck(r: VisitReadings, cap: CapacityState): ReadingCheck | null {
  if ((r.mode ?? 'cooling') !== 'cooling' || r.liquidPressurePsig === undefined || r.liquidLineTempF === undefined || !r.refrigerant) {
    return null;
  }
  const value = round(subcoolingF({ refrigerant: r.refrigerant, liquidPressurePsig: r.liquidPressurePsig, liquidLineTempF: r.liquidLineTempF, altitudeFt: r.altitudeFt }), 1);
  const alt = altitudeNote(r);
  if (!cap.judgeCharge) {
    return {
      check: 'subcooling',
      value,
      unit: '°F',
      expected: {},
      status: 'watch',
      message: `Subcooling ${value.toFixed(1)} °F${at(cap)}; ${FULL_CAPACITY_TEST_PROMPT}`,
      source: `Variable-speed unit: charge is judged only at forced full capacity (common practice; the maker's test or charge mode)${alt}`,
    };
  }
  const target = r.subcoolingTargetF;
  if (target === undefined) {
    return {
      check: 'subcooling',
      value,
      unit: '°F',
      expected: {},
      status: 'watch',
      message: `Subcooling ${value.toFixed(1)} °F; nameplate target needed`,
      source: `Nameplate subcooling target (not entered)${alt}`,
    };
  }
  const min = round(target - SUBCOOLING_TOLERANCE_F, 1);
  const max = round(target + SUBCOOLING_TOLERANCE_F, 1);
  return {
    check: 'subcooling',
    value,
    unit: '°F',
    expected: { min, max, target },
    status: rateBand(value, min, max),
    message: `Subcooling ${value.toFixed(1)} °F, target ${b(target)} °F ±${SUBCOOLING_TOLERANCE_F}`,
    source: `Nameplate subcooling target ±${SUBCOOLING_TOLERANCE_F} °F (common practice)${alt}`,
  };
}

const CAPACITOR_LABEL: Record<CapacitorPosition, string> = {
  compressor: 'Compressor capacitor',
  outdoorFan: 'Outdoor fan capacitor',
  blower: 'Blower capacitor',
};
const CAPACITOR_CHECK: Record<CapacitorPosition, string> = {
  compressor: 'capacitor_compressor',
  outdoorFan: 'capacitor_outdoor_fan',
  blower: 'capacitor_blower',
};

function capacitorCheck(r: VisitReadings, pos: CapacitorPosition): ReadingCheck | null {
  const c = r.capacitors?.[pos];
  if (!c) return null;
  let measured = c.measuredUf;
  let how = '';
  if (measured === undefined && c.measuredAmps !== undefined && c.measuredVolts !== undefined) {
    measured = microfaradsFromCurrent({ amps: c.measuredAmps, volts: c.measuredVolts, hz: c.frequencyHz });
    how = ' from current';
  }
  // Nothing measured yet: nothing to report.
  if (measured === undefined) return null;
  const value = round(measured, 2);
  const label = CAPACITOR_LABEL[pos];
  const fromCurrentSource = how ? '; µF from current under load: 10^6 × A ÷ (2π f V), 2652 × A ÷ V at 60 Hz' : '';
  if (c.ratedUf === undefined) {
    return {
      check: CAPACITOR_CHECK[pos],
      value,
      unit: 'µF',
      expected: {},
      status: 'watch',
      message: `${label} ${value.toFixed(2)} µF${how}; rating needed to judge it`,
      source: `Rating printed on the capacitor (not entered)${fromCurrentSource}`,
    };
  }
  const tol = c.tolerancePct ?? RUN_CAPACITOR_DEFAULT_TOLERANCE_PCT;
  const min = round(c.ratedUf * (1 - tol / 100), 2);
  const max = round(c.ratedUf * (1 + tol / 100), 2);
  return {
    check: CAPACITOR_CHECK[pos],
    value,
    unit: 'µF',
    expected: { min, max, target: c.ratedUf },
    status: rateBand(value, min, max),
    message: `${label} ${value.toFixed(2)} µF${how}, rated ${b(c.ratedUf)} µF ±${b(tol)} % (${min.toFixed(2)}–${max.toFixed(2)})`,
    source: `${c.tolerancePct === undefined ? `Common practice: ±${RUN_CAPACITOR_DEFAULT_TOLERANCE_PCT} % run capacitor tolerance (none entered)` : 'Rating and tolerance printed on the capacitor'}${fromCurrentSource}`,
  };
}

const MOTORS = [
  { check: 'amps_compressor', label: 'Compressor', amps: 'compressorAmps', rated: 'compressorRatedLoadAmps', plate: 'RLA' },
  { check: 'amps_outdoor_fan', label: 'Outdoor fan', amps: 'outdoorFanAmps', rated: 'outdoorFanFullLoadAmps', plate: 'FLA' },
  { check: 'amps_blower', label: 'Blower', amps: 'blowerAmps', rated: 'blowerFullLoadAmps', plate: 'FLA' },
] as const;

function ampsCheck(r: VisitReadings, m: (typeof MOTORS)[number]): ReadingCheck | null {
  const amps = r[m.amps];
  if (amps === undefined) return null;
  const value = round(amps, 1);
  const rated = r[m.rated];
  const compressor = m.check === 'amps_compressor';
  const notRunningBelow = compressor ? (rated !== undefined ? rated * COMPRESSOR_NOT_RUNNING_FRACTION : COMPRESSOR_NOT_RUNNING_A) : null;
  if (notRunningBelow !== null && value < notRunningBelow) {
    return {
      check: m.check,
      value,
      unit: 'A',
      expected: rated !== undefined ? { min: round(notRunningBelow, 1), max: rated } : { min: COMPRESSOR_NOT_RUNNING_A },
      status: 'alert',
      message: `Compressor ${value.toFixed(1)} A: compressor not running${rated !== undefined ? ` (RLA ${rated.toFixed(1)} A)` : ''}; check the contactor, capacitor and internal overload`,
      source: `Common practice: a compressor that should be running draws far more than ${rated !== undefined ? `${Math.round(COMPRESSOR_NOT_RUNNING_FRACTION * 100)} % of its RLA` : `${COMPRESSOR_NOT_RUNNING_A} A`}; near zero means it is off`,
    };
  }
  if (rated === undefined) {
    return {
      check: m.check,
      value,
      unit: 'A',
      expected: {},
      status: 'watch',
      message: `${m.label} ${value.toFixed(1)} A; nameplate ${m.plate} needed`,
      source: `Nameplate ${m.plate} (not entered)`,
    };
  }
  const share = value / rated;
  const status: CheckStatus = share > 1 ? 'alert' : share > AMPS_WATCH_FRACTION ? 'watch' : 'ok';
  return {
    check: m.check,
    value,
    unit: 'A',
    expected: compressor ? { min: round(rated * COMPRESSOR_NOT_RUNNING_FRACTION, 1), max: rated } : { max: rated },
    status,
    message: `${m.label} ${value.toFixed(1)} A, ${m.plate} ${rated.toFixed(1)} A (${Math.round(share * 100)} %)`,
    source: compressor
      ? `Nameplate RLA, a rating and not the expected running current (UL 1995: maximum continuous current ÷ 1.56, from memory): running above it is an overload, within 10 % below it rates watch, under ${Math.round(COMPRESSOR_NOT_RUNNING_FRACTION * 100)} % of it the compressor is not running (common practice)`
      : `Nameplate ${m.plate}: above it is an overload; within 10 % below it rates watch (common practice)`,
  };
}

function controlVoltageCheck(r: VisitReadings): ReadingCheck | null {
  if (r.controlVoltageVac === undefined) return null;
  const value = round(r.controlVoltageVac, 1);
  const n = CONTROL_VOLTAGE_NOMINAL_VAC;
  const min = round(n * (1 - CONTROL_OK_FRACTION), 1);
  const max = round(n * (1 + CONTROL_OK_FRACTION), 1);
  const margin = n * (CONTROL_WATCH_FRACTION - CONTROL_OK_FRACTION);
  return {
    check: 'control_voltage',
    value,
    unit: 'VAC',
    expected: { min, max, target: n },
    status: rateBand(value, min, max, margin),
    message: `Control ${value.toFixed(1)} VAC, nominal ${n} VAC (${b(min)}–${b(max)})`,
    source: '24 VAC nominal class 2 control circuit, ±10 % in range (common practice); ±10–20 % is our watch band',
  };
}

function capacityCheck(r: VisitReadings, cap: CapacityState): ReadingCheck | null {
  if ((r.mode ?? 'cooling') !== 'cooling' || r.airflowCfm === undefined || r.nominalTons === undefined) return null;
  if (r.returnDryBulbF === undefined || r.supplyDryBulbF === undefined) return null;
  const factor = sensibleHeatFactor({ altitudeFt: r.altitudeFt, airflowBasis: r.airflowBasis });
  const value = Math.round(
    sensibleCapacityBtuh({ airflowCfm: r.airflowCfm, temperatureSplitF: r.returnDryBulbF - r.supplyDryBulbF, altitudeFt: r.altitudeFt, airflowBasis: r.airflowBasis }),
  );
  const factorNote =
    factor === 1.08
      ? `Sensible heat 1.08 × CFM × ΔT for standard air (ASHRAE Fundamentals)${r.airflowBasis === undefined ? '; airflow taken as standard CFM' : ''}`
      : `Sensible heat ${factor.toFixed(3)} × actual CFM × ΔT: 1.08 scaled by the air density at ${grouped(r.altitudeFt!)} ft (ASHRAE standard atmosphere via psychrolib)`;
  const source = `${factorNote}; nominal 12,000 Btu/h per ton; sensible normally 60–100 % of nominal, about 75 % (common practice); under 50 % rates alert, above nominal rates watch (our bands)`;
  const nominal = r.nominalTons * BTUH_PER_TON;
  if (cap.pct === null) {
    return { check: 'sensible_capacity', value, unit: 'Btu/h', expected: {}, status: 'watch', message: `Sensible ${grouped(value)} Btu/h; ${PART_LOAD_NEEDED}`, source };
  }
  const share = cap.pct / 100;
  const expectedNominal = nominal * share;
  const min = Math.round(expectedNominal * SENSIBLE_SHARE.min);
  const max = Math.round(expectedNominal * SENSIBLE_SHARE.max);
  const status: CheckStatus = value < expectedNominal * SENSIBLE_SHARE.alertBelow ? 'alert' : value >= min && value <= max ? 'ok' : 'watch';
  return {
    check: 'sensible_capacity',
    value,
    unit: 'Btu/h',
    expected: { min, max, target: Math.round(expectedNominal * SENSIBLE_SHARE.target) },
    status,
    message:
      share < 1
        ? `Sensible ${grouped(value)} Btu/h, ${Math.round((value / expectedNominal) * 100)} % of ${grouped(expectedNominal)} expected${at(cap)}`
        : `Sensible ${grouped(value)} Btu/h, ${Math.round((value / nominal) * 100)} % of nominal ${grouped(nominal)}`,
    source: share < 1 ? `${source}; bands scaled to the percent of capacity (our method)` : source,
  };
}

function airflowCheck(r: VisitReadings, cap: CapacityState): ReadingCheck | null {
  if (r.airflowCfm === undefined || r.nominalTons === undefined) return null;
  const scfm = standardCfm({ airflowCfm: r.airflowCfm, altitudeFt: r.altitudeFt, airflowBasis: r.airflowBasis });
  const value = Math.round(scfm / r.nominalTons);
  const converted = scfm !== r.airflowCfm ? `; actual CFM restated as standard CFM for ${grouped(r.altitudeFt!)} ft (ASHRAE standard atmosphere via psychrolib)` : '';
  const source = `Common practice: 350–450 standard CFM per nominal ton, 400 typical; 50 CFM/ton beyond the band is our watch margin${converted}`;
  if (cap.pct === null) {
    return { check: 'airflow_per_ton', value, unit: 'CFM/ton', expected: {}, status: 'watch', message: `Airflow ${value} CFM/ton; ${PART_LOAD_NEEDED}`, source };
  }
  const share = cap.pct / 100;
  // A variable-speed blower slows with the compressor: the floor scales with the percent of capacity.
  const min = Math.round(AIRFLOW_CFM_PER_TON.min * share);
  const max = AIRFLOW_CFM_PER_TON.max;
  return {
    check: 'airflow_per_ton',
    value,
    unit: 'CFM/ton',
    expected: { min, max, target: Math.round(400 * share) },
    status: rateBand(value, min, max, AIRFLOW_WATCH_MARGIN_CFM_PER_TON * share),
    message: `Airflow ${value} CFM/ton, target ${min}–${max}${at(cap)}`,
    source: share < 1 ? `${source}; below full capacity the low end and the margin scale with the percent of capacity (our method)` : source,
  };
}

function staticPressureCheck(r: VisitReadings): ReadingCheck | null {
  if (r.totalExternalStaticInWc === undefined) return null;
  const value = round(r.totalExternalStaticInWc, 2);
  const given = r.maxExternalStaticInWc;
  const max = given ?? DEFAULT_MAX_EXTERNAL_STATIC_IN_WC;
  return {
    check: 'external_static_pressure',
    value,
    unit: 'in. w.c.',
    expected: { max },
    status: rateBand(value, 0, max, STATIC_WATCH_MARGIN_IN_WC),
    message: `Total external static ${value.toFixed(2)} in. w.c., maximum ${max.toFixed(2)}${given === undefined ? ' (usual residential)' : ''}`,
    source: `${given === undefined ? `Common practice: ${DEFAULT_MAX_EXTERNAL_STATIC_IN_WC} in. w.c. is the usual residential maximum (no nameplate figure entered)` : 'Nameplate or blower-table maximum external static pressure, as entered'}; up to ${STATIC_WATCH_MARGIN_IN_WC} in. w.c. above it rates watch (our band)`,
  };
}

function flueCoCheck(r: VisitReadings): ReadingCheck | null {
  if (r.flueCoAirFreePpm === undefined) return null;
  const value = Math.round(r.flueCoAirFreePpm);
  const { service, hazard } = FLUE_CO_AIR_FREE_PPM;
  const status: CheckStatus = value > hazard ? 'alert' : value > service ? 'watch' : 'ok';
  return {
    check: 'co_flue_air_free',
    value,
    unit: 'ppm',
    expected: { max: service },
    status,
    message:
      status === 'alert'
        ? `Flue CO ${value} ppm air-free, above ${hazard}: hazardous, stop and make the appliance safe`
        : `Flue CO ${value} ppm air-free, action level ${service}${status === 'watch' ? ': the burner needs service' : ''}`,
    source: `ANSI Z21.47/CSA 2.3 gas-fired central furnaces: at most ${hazard} ppm air-free CO in the flue products; above ${service} ppm air-free the burner needs service (BPI-1200 combustion safety, from memory)`,
    ...(status === 'alert' ? { caution: 'co_hazard' } : {}),
  };
}

function ambientCoCheck(r: VisitReadings): ReadingCheck | null {
  if (r.ambientCoPpm === undefined) return null;
  const value = Math.round(r.ambientCoPpm);
  const { investigate, hazard } = AMBIENT_CO_PPM;
  const status: CheckStatus = value > hazard ? 'alert' : value > investigate ? 'watch' : 'ok';
  return {
    check: 'co_ambient',
    value,
    unit: 'ppm',
    expected: { max: investigate },
    status,
    message:
      status === 'alert'
        ? `Living-space CO ${value} ppm, above ${hazard}: hazardous, stop and make the appliance safe`
        : `Living-space CO ${value} ppm, up to ${investigate} expected${status === 'watch' ? ': find the source' : ''}`,
    source: `U.S. EPA national ambient air quality standard for CO: ${investigate} ppm over 8 hours, ${hazard} ppm over 1 hour; above ${hazard} ppm in the home is hazardous (common practice)`,
    ...(status === 'alert' ? { caution: 'co_hazard' } : {}),
  };
}

/**
 * Validate one visit's readings and rate each check that has its inputs.
 * Throws ReadingInputError naming the first bad field.
 */
export function evaluateReadings(input: VisitReadings): ReadingCheck[] {
  const parsed = visitReadingsSchema.safeParse(input);
  if (!parsed.success) {
    const issue = parsed.error.issues[0]!;
    const path = issue.path.map(String);
    // A misspelt field name is reported under that name.
    if (issue.code === 'unrecognized_keys') {
      const key = issue.keys[0] ?? '';
      throw new ReadingInputError([...path, key].join('.'), `unknown field "${key}"; field names carry their units, e.g. returnDryBulbF`);
    }
    throw new ReadingInputError(path.join('.') || 'readings', issue.message);
  }
  const r = parsed.data;
  const cap = capacityState(r);
  const checks: (ReadingCheck | null)[] = [
    splitCheck(r, cap),
    riseCheck(r),
    superheatCheck(r, cap),
    subcoolingCheck(r, cap),
    ...CAPACITOR_POSITIONS.map((pos) => capacitorCheck(r, pos)),
    ...MOTORS.map((m) => ampsCheck(r, m)),
    controlVoltageCheck(r),
    capacityCheck(r, cap),
    airflowCheck(r, cap),
    staticPressureCheck(r),
    flueCoCheck(r),
    ambientCoCheck(r),
  ];
  return checks.filter((c): c is ReadingCheck => c !== null);
}
