import { AIRFLOW_CFM_PER_TON, BTUH_PER_TON, sensibleCapacityBtuh } from './airflow';
import {
  EXPANSION_VALVE_DEFAULT_SUPERHEAT_F,
  FIXED_ORIFICE_MIN_TARGET_SUPERHEAT_F,
  FIXED_ORIFICE_TOLERANCE_F,
  SUBCOOLING_TOLERANCE_F,
  targetSuperheatF,
} from './charge';
import { CONTROL_VOLTAGE_NOMINAL_VAC, RUN_CAPACITOR_DEFAULT_TOLERANCE_PCT, microfaradsFromCurrent } from './electrical';
import { ReadingInputError } from './errors';
import { wetBulbF } from './psychrometrics';
import { CAPACITOR_POSITIONS, type CapacitorPosition, type VisitReadings, visitReadingsSchema } from './readings';
import { subcoolingF, superheatF } from './refrigerants';

export type CheckStatus = 'ok' | 'watch' | 'alert';

export interface ReadingCheck {
  check: string;
  value: number;
  unit: string;
  expected: { min?: number; max?: number; target?: number };
  status: CheckStatus;
  message: string;
  source: string;
}

/** Cooling split band around its target (common practice: 16–22 °F around 20 °F). */
export const COOLING_SPLIT_F = { target: 20, below: 4, above: 2 } as const;
/** Return RH above which the split target is lowered, and by how much per % RH (our method). */
export const SPLIT_HUMIDITY_KNEE_PCT = 50;
export const SPLIT_DROP_F_PER_PCT_RH = 0.2;
/** Outside-the-band margins that still rate 'watch' rather than 'alert' (our bands). */
const SPLIT_WATCH_MARGIN_F = 2;
const AIRFLOW_WATCH_MARGIN_CFM_PER_TON = 50;
/** Running amps above this share of nameplate rate 'watch' (common practice). */
const AMPS_WATCH_FRACTION = 0.9;
const CONTROL_OK_FRACTION = 0.1;
const CONTROL_WATCH_FRACTION = 0.2;
/** Sensible share of nominal capacity (common practice: about 0.75 at normal indoor humidity). */
const SENSIBLE_SHARE = { min: 0.6, target: 0.75, max: 1, alertBelow: 0.5 } as const;

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

/** Split target for the return air's humidity: 20 °F, lowered 2 °F per 10 % RH above 50 % (our method). */
export function coolingSplitTargetF(returnRelativeHumidityPct?: number): number {
  const rh = returnRelativeHumidityPct ?? SPLIT_HUMIDITY_KNEE_PCT;
  return COOLING_SPLIT_F.target - Math.max(0, rh - SPLIT_HUMIDITY_KNEE_PCT) * SPLIT_DROP_F_PER_PCT_RH;
}

function splitCheck(r: VisitReadings): ReadingCheck | null {
  if ((r.mode ?? 'cooling') !== 'cooling' || r.returnDryBulbF === undefined || r.supplyDryBulbF === undefined) return null;
  const value = round(r.returnDryBulbF - r.supplyDryBulbF, 1);
  const target = round(coolingSplitTargetF(r.returnRelativeHumidityPct), 1);
  const min = round(target - COOLING_SPLIT_F.below, 1);
  const max = round(target + COOLING_SPLIT_F.above, 1);
  const humid = target < COOLING_SPLIT_F.target;
  return {
    check: 'temperature_split',
    value,
    unit: '°F',
    expected: { min, max, target },
    status: rateBand(value, min, max, SPLIT_WATCH_MARGIN_F),
    message: `Split ${value.toFixed(1)} °F, target ${b(min)}–${b(max)} °F${humid ? ` (return ${b(r.returnRelativeHumidityPct!)} % RH)` : ''}`,
    source:
      'Common practice: 16–22 °F split around a 20 °F target; our humidity method lowers the band 2 °F per 10 % return RH above 50 %; 2 °F beyond the band is our watch margin',
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
  if (r.indoorWetBulbF !== undefined) return { wb: r.indoorWetBulbF, computed: false };
  if (r.returnDryBulbF !== undefined && r.returnRelativeHumidityPct !== undefined) {
    const wb = wetBulbF({ dryBulbF: r.returnDryBulbF, relativeHumidityPct: r.returnRelativeHumidityPct, altitudeFt: r.altitudeFt });
    return { wb, computed: true };
  }
  return null;
}

function superheatCheck(r: VisitReadings): ReadingCheck | null {
  if ((r.mode ?? 'cooling') !== 'cooling' || r.suctionPressurePsig === undefined || r.suctionLineTempF === undefined || !r.refrigerant) {
    return null;
  }
  const value = round(
    superheatF({ refrigerant: r.refrigerant, suctionPressurePsig: r.suctionPressurePsig, suctionLineTempF: r.suctionLineTempF }),
    1,
  );
  const base = { check: 'superheat', value, unit: '°F' };
  const shown = `Superheat ${value.toFixed(1)} °F`;

  if (r.meteringDevice === 'txv' || r.meteringDevice === 'eev') {
    const valve = r.meteringDevice.toUpperCase();
    const given = r.manufacturerSuperheatRangeF;
    const { min, max } = given ?? EXPANSION_VALVE_DEFAULT_SUPERHEAT_F;
    const status = rateBand(value, min, max);
    return {
      ...base,
      expected: { min, max },
      // Off a default band is a prompt to look up the manufacturer's figure, not a verdict.
      status: given || status === 'ok' ? status : 'watch',
      message: `${shown}, range ${b(min)}–${b(max)} °F (${valve}${given ? '' : ', default'})`,
      source: given
        ? `Manufacturer's superheat range for this ${valve} system, as entered`
        : `Common practice: 8–12 °F at a ${valve} when no manufacturer range is entered; outside it rates watch`,
    };
  }

  if (r.meteringDevice === 'fixed') {
    const fixedSource = `Fixed-orifice superheat charging method: target = ((3 × indoor WB) − 80 − outdoor DB) / 2, ±${FIXED_ORIFICE_TOLERANCE_F} °F (common practice; service literature)`;
    const wb = indoorWetBulb(r);
    if (!wb || r.outdoorDryBulbF === undefined) {
      return {
        ...base,
        expected: {},
        status: 'watch',
        message: `${shown}; indoor wet bulb and outdoor dry bulb needed for the target`,
        source: fixedSource,
      };
    }
    const wbNote = wb.computed ? '; indoor WB computed from return dry bulb and RH (ASHRAE Fundamentals psychrometrics via psychrolib)' : '';
    const target = targetSuperheatF({ indoorWetBulbF: wb.wb, outdoorDryBulbF: r.outdoorDryBulbF });
    if (target === null) {
      return {
        ...base,
        expected: {},
        status: 'watch',
        message: `${shown}; target below ${FIXED_ORIFICE_MIN_TARGET_SUPERHEAT_F} °F, do not charge by superheat at these conditions`,
        source: `${fixedSource}; the method is not used where the target falls below ${FIXED_ORIFICE_MIN_TARGET_SUPERHEAT_F} °F${wbNote}`,
      };
    }
    const t = round(target, 1);
    const min = round(t - FIXED_ORIFICE_TOLERANCE_F, 1);
    const max = round(t + FIXED_ORIFICE_TOLERANCE_F, 1);
    return {
      ...base,
      expected: { min, max, target: t },
      status: rateBand(value, min, max),
      message: `${shown}, target ${t.toFixed(1)} °F ±${FIXED_ORIFICE_TOLERANCE_F} (fixed orifice)`,
      source: `${fixedSource}${wbNote}`,
    };
  }

  return {
    ...base,
    expected: {},
    status: 'watch',
    message: `${shown}; metering device needed to set the target`,
    source: 'Target depends on the metering device: fixed-orifice method or TXV/EEV range',
  };
}

function subcoolingCheck(r: VisitReadings): ReadingCheck | null {
  if ((r.mode ?? 'cooling') !== 'cooling' || r.liquidPressurePsig === undefined || r.liquidLineTempF === undefined || !r.refrigerant) {
    return null;
  }
  const value = round(
    subcoolingF({ refrigerant: r.refrigerant, liquidPressurePsig: r.liquidPressurePsig, liquidLineTempF: r.liquidLineTempF }),
    1,
  );
  const target = r.subcoolingTargetF;
  if (target === undefined) {
    return {
      check: 'subcooling',
      value,
      unit: '°F',
      expected: {},
      status: 'watch',
      message: `Subcooling ${value.toFixed(1)} °F; nameplate target needed`,
      source: 'Nameplate subcooling target (not entered)',
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
    source: `Nameplate subcooling target ±${SUBCOOLING_TOLERANCE_F} °F (common practice)`,
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
    expected: { max: rated },
    status,
    message: `${m.label} ${value.toFixed(1)} A, ${m.plate} ${rated.toFixed(1)} A (${Math.round(share * 100)} %)`,
    source: `Nameplate ${m.plate}: above it is an overload; within 10 % below it rates watch (common practice)`,
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

function capacityCheck(r: VisitReadings): ReadingCheck | null {
  if ((r.mode ?? 'cooling') !== 'cooling' || r.airflowCfm === undefined || r.nominalTons === undefined) return null;
  if (r.returnDryBulbF === undefined || r.supplyDryBulbF === undefined) return null;
  const value = Math.round(sensibleCapacityBtuh({ airflowCfm: r.airflowCfm, temperatureSplitF: r.returnDryBulbF - r.supplyDryBulbF }));
  const nominal = r.nominalTons * BTUH_PER_TON;
  const min = Math.round(nominal * SENSIBLE_SHARE.min);
  const max = Math.round(nominal * SENSIBLE_SHARE.max);
  const status: CheckStatus =
    value < nominal * SENSIBLE_SHARE.alertBelow ? 'alert' : value >= min && value <= max ? 'ok' : 'watch';
  return {
    check: 'sensible_capacity',
    value,
    unit: 'Btu/h',
    expected: { min, max, target: Math.round(nominal * SENSIBLE_SHARE.target) },
    status,
    message: `Sensible ${grouped(value)} Btu/h, ${Math.round((value / nominal) * 100)} % of nominal ${grouped(nominal)}`,
    source:
      'Sensible heat 1.08 × CFM × ΔT for standard air (ASHRAE Fundamentals); nominal 12,000 Btu/h per ton; sensible normally 60–100 % of nominal, about 75 % (common practice); under 50 % rates alert, above nominal rates watch (our bands)',
  };
}

function airflowCheck(r: VisitReadings): ReadingCheck | null {
  if (r.airflowCfm === undefined || r.nominalTons === undefined) return null;
  const value = Math.round(r.airflowCfm / r.nominalTons);
  const { min, max } = AIRFLOW_CFM_PER_TON;
  return {
    check: 'airflow_per_ton',
    value,
    unit: 'CFM/ton',
    expected: { min, max, target: 400 },
    status: rateBand(value, min, max, AIRFLOW_WATCH_MARGIN_CFM_PER_TON),
    message: `Airflow ${value} CFM/ton, target ${min}–${max}`,
    source: 'Common practice: 350–450 CFM per nominal ton, 400 typical; 50 CFM/ton beyond the band is our watch margin',
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
  const checks: (ReadingCheck | null)[] = [
    splitCheck(r),
    riseCheck(r),
    superheatCheck(r),
    subcoolingCheck(r),
    ...CAPACITOR_POSITIONS.map((pos) => capacitorCheck(r, pos)),
    ...MOTORS.map((m) => ampsCheck(r, m)),
    controlVoltageCheck(r),
    capacityCheck(r),
    airflowCheck(r),
  ];
  return checks.filter((c): c is ReadingCheck => c !== null);
}
