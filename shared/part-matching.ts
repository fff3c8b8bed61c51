// Which stocked parts can replace a failed motor or capacitor, and what the swap needs. Pure:
// the server lists the candidates (price-book items with their specs and where they are stocked),
// and this decides from the failed part's nameplate.
import {
  DEFAULT_CAPACITOR_TOLERANCE_PCT,
  formatHorsepower,
  formatHpRange,
  formatVoltRanges,
  HP_EPSILON,
  MOTOR_APPLICATION_LABELS,
  SPEED_TAPS,
  type SpeedTap,
  type VoltRange,
} from './pricebook';
import type { CapacitorSpec, FailedCapacitor, FailedMotor, MotorSpec, PartSpec, RotationView, StockLocationKind } from './schemas/pricebook';

export type Place = 'this_truck' | 'other_truck' | 'shop' | 'order';
export const PLACE_ORDER: readonly Place[] = ['this_truck', 'other_truck', 'shop', 'order'];
export const PLACE_LABELS: Record<Place, string> = { this_truck: 'On your truck', other_truck: 'On another truck', shop: 'At the shop', order: 'To order' };

export interface PartCandidate {
  itemId: string;
  sku: string;
  name: string;
  spec: PartSpec | null;
  /** Where it is stocked; null for a price-book part stocked nowhere (it would be ordered). */
  location: { id: string; kind: StockLocationKind; name: string } | null;
  quantity: number;
}

export type MatchField = 'stock' | 'spec' | 'application' | 'phase' | 'rpm' | 'volts' | 'horsepower' | 'amps' | 'speeds' | 'rotation' | 'shaft' | 'frame' | 'microfarads' | 'shape';

export interface MatchPoint {
  field: MatchField;
  text: string;
}

export interface ReplacementFit {
  candidate: PartCandidate;
  place: Place;
  matches: MatchPoint[];
  /** Values that differ but do not stop the swap. */
  differs: MatchPoint[];
  /** What the swap needs, in the order the technician does it. */
  needs: string[];
  /** For a motor that runs on a capacitor: the one its horsepower tap needs, and the stocked ones that fit. */
  capacitor: { microfarads: number; volts: number; fits: ReplacementFit[] } | null;
}

export interface ReplacementRefusal {
  candidate: PartCandidate;
  place: Place;
  reasons: MatchPoint[];
  matches: MatchPoint[];
}

export interface ReplacementResult {
  fits: ReplacementFit[];
  refused: ReplacementRefusal[];
}

const EPS = 1e-9;
const use = (a: keyof typeof MOTOR_APPLICATION_LABELS) => `${/^[aeiou]/.test(MOTOR_APPLICATION_LABELS[a]) ? 'an' : 'a'} ${MOTOR_APPLICATION_LABELS[a]}`;
const num = (x: number) => `${Number(x.toFixed(3))}`;

function placeOf(c: PartCandidate, thisTruckId: string | null): Place {
  if (!c.location) return 'order';
  if (c.location.kind === 'shop') return 'shop';
  return c.location.id === thisTruckId ? 'this_truck' : 'other_truck';
}

// ---- Motors ----

/**
 * Synchronous speeds at 60 Hz: n = 120 × f ÷ poles (induction-motor theory). A nameplate's
 * full-load RPM sits a few percent below its pole count's synchronous speed.
 */
const SYNC_RPM_60HZ = [3600, 1800, 1200, 900, 720, 600, 514, 450];
const syncSpeedOf = (rpm: number) => [...SYNC_RPM_60HZ].reverse().find((s) => s >= rpm) ?? 3600;
/** Same RPM: the same pole count and within 5 % of the old nameplate (common practice). */
export const RPM_TOLERANCE = 0.05;

/**
 * A nominal supply and the nameplate voltage made for it: 120 V → 115 V, 208 V → 200 V,
 * 240 V → 230 V, 480 V → 460 V (ANSI C84.1 system voltages and NEMA MG 1 nameplate voltages,
 * from memory).
 */
const NAMEPLATE_FOR_SUPPLY: Record<number, number> = { 120: 115, 208: 200, 240: 230, 277: 265, 480: 460 };

const inRange = (r: VoltRange, v: number) => v >= r.min - EPS && v <= r.max + EPS;
function coversSupply(ranges: readonly VoltRange[], supply: number): boolean {
  const nameplate = NAMEPLATE_FOR_SUPPLY[supply];
  return ranges.some((r) => inRange(r, supply) || (nameplate !== undefined && inRange(r, nameplate)));
}

const flip = (d: 'cw' | 'ccw') => (d === 'cw' ? 'ccw' : 'cw');
/** Rotation seen from the shaft end: CW from the lead end is CCW from the shaft end. */
const fromShaftEnd = (d: 'cw' | 'ccw', view: RotationView) => (view === 'shaft_end' ? d : flip(d));
const DIR = { cw: 'CW', ccw: 'CCW' } as const;

/** Tap names by the number of speeds, highest first. */
function tapsOf(speeds: number): SpeedTap[] {
  switch (speeds) {
    case 1:
      return ['high'];
    case 2:
      return ['high', 'low'];
    case 3:
      return ['high', 'medium', 'low'];
    case 4:
      return ['high', 'medium_high', 'medium_low', 'low'];
    default:
      return [...SPEED_TAPS];
  }
}
const tapWord = (t: SpeedTap) => t.replace('_', '-');
const listed = (xs: string[]) => (xs.length < 2 ? xs.join('') : `${xs.slice(0, -1).join(', ')} and ${xs[xs.length - 1]}`);

/**
 * The old motor's taps in use, placed on the new motor's taps by their position from high to low,
 * each on its own tap (common practice: the highest call stays on the highest tap).
 */
function mapTaps(used: SpeedTap[], oldSpeeds: number, newSpeeds: number): [SpeedTap, SpeedTap][] {
  const oldTaps = tapsOf(oldSpeeds);
  const newTaps = tapsOf(newSpeeds);
  const positions = used.map((t) => Math.max(0, oldTaps.indexOf(t))).sort((x, y) => x - y);
  const out: number[] = positions.map((p) => (oldSpeeds === 1 ? 0 : Math.round((p * (newSpeeds - 1)) / (oldSpeeds - 1))));
  for (let i = 1; i < out.length; i++) out[i] = Math.max(out[i]!, out[i - 1]! + 1);
  for (let i = out.length - 1; i >= 0; i--) out[i] = Math.min(out[i]!, newSpeeds - 1 - (out.length - 1 - i));
  return positions.map((p, i) => [oldTaps[p]!, newTaps[out[i]!]!]);
}

function speedNeed(f: FailedMotor, c: MotorSpec): string | null {
  if (c.speeds === 1) return null;
  if (!f.tapsInUse.length) {
    return `Speed taps: wire the ${f.speedsUsed === 1 ? 'call' : `${f.speedsUsed} calls`} to the taps that match the old motor's (the highest stays on high), and tape off the ${c.speeds - f.speedsUsed} unused lead${c.speeds - f.speedsUsed === 1 ? '' : 's'}.`;
  }
  const pairs = mapTaps(f.tapsInUse, f.speeds, c.speeds);
  const usedNew = new Set(pairs.map(([, n]) => n));
  const unused = tapsOf(c.speeds).filter((t) => !usedNew.has(t));
  const same = pairs.every(([o, n]) => o === n);
  const wiring = same ? `use the same taps as the old motor (${listed(pairs.map(([o]) => tapWord(o)))})` : pairs.map(([o, n]) => `old ${tapWord(o)} → ${tapWord(n)}`).join(', ');
  return `Speed taps: ${wiring}${unused.length ? `; tape off the unused ${listed(unused.map(tapWord))} lead${unused.length === 1 ? '' : 's'}` : ''}.`;
}

function matchMotor(
  f: FailedMotor,
  c: MotorSpec,
): { reasons: MatchPoint[]; matches: MatchPoint[]; differs: MatchPoint[]; needs: string[]; capacitor: { microfarads: number; volts: number } | null } {
  const reasons: MatchPoint[] = [];
  const matches: MatchPoint[] = [];
  const differs: MatchPoint[] = [];
  const needs: string[] = [];
  const hp = formatHorsepower(f.horsepower);

  // Blower motors are open and cooled by the air they move; condenser fan motors are closed
  // against the weather (common practice): a motor made for one use does not replace another.
  if (f.application && f.application !== 'other' && c.application !== 'other') {
    if (c.application === f.application) matches.push({ field: 'application', text: `Made for ${use(c.application)}.` });
    else reasons.push({ field: 'application', text: `Made for ${use(c.application)}, not ${use(f.application)}.` });
  }

  // A motor runs only on the phase it is wound for (common practice).
  if (c.phase === f.phase) matches.push({ field: 'phase', text: `${c.phase}-phase, like the old motor.` });
  else reasons.push({ field: 'phase', text: `${c.phase}-phase; the old motor is ${f.phase}-phase, and a motor runs only on the phase it is wound for.` });

  // The fan's speed sets the airflow: same pole count and nameplate RPM within 5 % (common practice).
  const sameClass = syncSpeedOf(c.rpm) === syncSpeedOf(f.rpm);
  const within = Math.abs(c.rpm - f.rpm) <= f.rpm * RPM_TOLERANCE + EPS;
  if (sameClass && within)
    matches.push({ field: 'rpm', text: c.rpm === f.rpm ? `${c.rpm} RPM, like the old motor.` : `${c.rpm} RPM against the old ${f.rpm} RPM: the same speed.` });
  else reasons.push({ field: 'rpm', text: `${c.rpm} RPM; the old motor turns ${f.rpm} RPM, and the fan's speed sets the airflow.` });

  // The rating must cover the supply it will run on (NEMA MG 1 rates motors at their nameplate voltage).
  if (f.supplyVolts !== null) {
    if (coversSupply(c.volts, f.supplyVolts)) matches.push({ field: 'volts', text: `Rated ${formatVoltRanges(c.volts)}: covers the ${f.supplyVolts} V supply.` });
    else reasons.push({ field: 'volts', text: `Rated ${formatVoltRanges(c.volts)}; the supply is ${f.supplyVolts} V.` });
  } else {
    const missing = f.volts.filter((o) => !c.volts.some((r) => r.min <= o.min + EPS && r.max >= o.max - EPS));
    if (!missing.length) matches.push({ field: 'volts', text: `Rated ${formatVoltRanges(c.volts)}: covers the old motor's ${formatVoltRanges(f.volts)}.` });
    else reasons.push({ field: 'volts', text: `Rated ${formatVoltRanges(c.volts)}; the old motor ran on ${formatVoltRanges(missing)}. Measure the supply to match on it alone.` });
  }

  // The same horsepower, or a multi-horsepower motor set to it (common practice: a larger motor
  // moves more air than the system is set for, a smaller one overheats).
  const multi = c.horsepower.max - c.horsepower.min > HP_EPSILON;
  const fitsHp = f.horsepower >= c.horsepower.min - HP_EPSILON && f.horsepower <= c.horsepower.max + HP_EPSILON;
  const tap = c.taps.find((t) => Math.abs(t.horsepower - f.horsepower) < HP_EPSILON) ?? (c.taps.length === 1 && !multi ? c.taps[0]! : null);
  if (!fitsHp) reasons.push({ field: 'horsepower', text: `${formatHpRange(c.horsepower)}; the old motor is ${hp}.` });
  else if (multi) {
    matches.push({ field: 'horsepower', text: `Multi-horsepower ${formatHpRange(c.horsepower)}: includes ${hp}.` });
    needs.push(`Wire it for ${hp}${tap ? ' on its horsepower tap' : ''}, as its label shows.`);
  } else matches.push({ field: 'horsepower', text: `${hp}, like the old motor.` });

  // Rated amps no higher than the old motor's: the circuit, the overload and the control board's
  // relay were sized for that draw (common practice).
  const amps = fitsHp && tap && tap.amps !== null ? tap.amps : c.fla;
  const onTap = fitsHp && tap && tap.amps !== null ? ` on the ${hp} tap` : '';
  if (amps <= f.amps + EPS) matches.push({ field: 'amps', text: `Rated ${num(amps)} A${onTap}: not above the old motor's ${num(f.amps)} A.` });
  else reasons.push({ field: 'amps', text: `Rated ${num(amps)} A${onTap}, above the old motor's ${num(f.amps)} A that the circuit and its protection were sized for.` });

  // At least as many speeds as the system uses (common practice).
  if (c.speeds >= f.speedsUsed) {
    (c.speeds === f.speeds ? matches : differs).push({
      field: 'speeds',
      text: `${c.speeds} speed${c.speeds === 1 ? '' : 's'}${c.speeds === f.speeds ? ', like the old motor' : `; the old motor had ${f.speeds}, and ${f.speedsUsed} ${f.speedsUsed === 1 ? 'is' : 'are'} used`}.`,
    });
    const need = speedNeed(f, c);
    if (need) needs.push(need);
  } else reasons.push({ field: 'speeds', text: `${c.speeds} speed${c.speeds === 1 ? '' : 's'}; the system uses ${f.speedsUsed}.` });

  // Rotation that matches, or a reversible motor set to it (common practice).
  if (f.rotation === 'unknown') {
    if (c.rotation === 'reversible') {
      matches.push({ field: 'rotation', text: 'Reversible.' });
      needs.push("Set the rotation to match the arrow on the blower housing, as the motor's label shows.");
    } else {
      const d = DIR[fromShaftEnd(c.rotation, c.rotationViewedFrom!)];
      differs.push({ field: 'rotation', text: `Turns only ${d} seen from the shaft end; the old motor's rotation was not recorded.` });
      needs.push(`Check the arrow on the blower housing: this motor turns only ${d} seen from the shaft end.`);
    }
  } else {
    const want = fromShaftEnd(f.rotation, f.rotationViewedFrom!);
    if (c.rotation === 'reversible') {
      matches.push({ field: 'rotation', text: 'Reversible.' });
      needs.push(`Set the rotation to ${DIR[want]} seen from the shaft end (${DIR[flip(want)]} seen from the lead end), as the motor's label shows.`);
    } else {
      const has = fromShaftEnd(c.rotation, c.rotationViewedFrom!);
      if (has === want) matches.push({ field: 'rotation', text: `Turns ${DIR[has]} seen from the shaft end, like the old motor.` });
      else reasons.push({ field: 'rotation', text: `Turns ${DIR[has]} seen from the shaft end and is not reversible; the old motor turned ${DIR[want]}.` });
    }
  }

  // Shaft and frame decide how it mounts, not whether it runs: differences, not refusals.
  if (f.shaft && c.shaft) {
    const sameDia = Math.abs(c.shaft.diameterIn - f.shaft.diameterIn) < 0.001;
    const sameLen = Math.abs(c.shaft.lengthIn - f.shaft.lengthIn) < 0.001;
    if (sameDia && sameLen) matches.push({ field: 'shaft', text: `Shaft ${num(c.shaft.diameterIn)} × ${num(c.shaft.lengthIn)} in, like the old motor.` });
    else {
      differs.push({
        field: 'shaft',
        text: `Shaft ${num(c.shaft.diameterIn)} × ${num(c.shaft.lengthIn)} in; the old one is ${num(f.shaft.diameterIn)} × ${num(f.shaft.lengthIn)} in.`,
      });
      if (!sameDia)
        needs.push(
          c.shaft.diameterIn < f.shaft.diameterIn
            ? 'Fit a shaft bushing: the wheel hub is bored for the larger old shaft.'
            : 'The shaft is thicker than the old one: the wheel hub must be bored for it.',
        );
      if (c.shaft.lengthIn < f.shaft.lengthIn - 0.001) needs.push("Check that the wheel's set screw still lands on the shorter shaft's flat.");
    }
  }
  if (f.frame && c.frame) {
    if (f.frame.toUpperCase() === c.frame.toUpperCase()) matches.push({ field: 'frame', text: `Frame ${c.frame}, like the old motor.` });
    else {
      differs.push({ field: 'frame', text: `Frame ${c.frame}; the old one is ${f.frame}.` });
      needs.push('Check the mount: a different frame may need another bracket or belly band.');
    }
  }

  // The run capacitor for the horsepower tap that will be wired (the motor's label).
  let capacitor: { microfarads: number; volts: number } | null = null;
  if (fitsHp && c.taps.length) {
    if (tap && c.capacitorVolts !== null) {
      capacitor = { microfarads: tap.microfarads, volts: c.capacitorVolts };
      const size = `${num(tap.microfarads)} µF ${c.capacitorVolts} V`;
      if (f.oldCapacitorMicrofarads !== null && Math.abs(f.oldCapacitorMicrofarads - tap.microfarads) < 0.001)
        needs.push(`Run capacitor: ${size} for ${hp}, the same size as the old one; fit a new one if the old one tests outside its rating.`);
      else needs.push(`Run capacitor: fit ${size} for ${hp}${f.oldCapacitorMicrofarads !== null ? ` (the old one is ${num(f.oldCapacitorMicrofarads)} µF)` : ''}.`);
    } else needs.push(`Read the run capacitor for ${hp} on the motor's label: it is not recorded in the price book.`);
  } else if (fitsHp && !c.taps.length && f.oldCapacitorMicrofarads !== null) {
    needs.push('This motor runs without a run capacitor: take the old one out of the circuit.');
  }
  if (c.speeds > 1 || multi) needs.push('After the swap, check the temperature rise against the rating plate.');
  return { reasons, matches, differs, needs, capacitor };
}

// ---- Capacitors ----

const sectionName = (i: number, n: number) => (n === 2 ? (i === 0 ? 'HERM ' : 'FAN ') : '');
const sections = (us: readonly number[]) => `${us.map(num).join('/')} µF`;

function matchCapacitor(f: FailedCapacitor, c: CapacitorSpec): { reasons: MatchPoint[]; matches: MatchPoint[]; differs: MatchPoint[]; needs: string[] } {
  const reasons: MatchPoint[] = [];
  const matches: MatchPoint[] = [];
  const differs: MatchPoint[] = [];
  const needs: string[] = [];
  const n = f.microfarads.length;

  if (c.microfarads.length !== n) {
    // Two single cans wired side by side stand in for a dual one (common practice): search each section.
    reasons.push({
      field: 'microfarads',
      text:
        n === 2
          ? `A single ${sections(c.microfarads)} can; the old one is a dual ${sections(f.microfarads)}. Two single capacitors can stand in for it: search for each section.`
          : `A dual ${sections(c.microfarads)} can; the old one is a single ${sections(f.microfarads)}.`,
    });
  } else {
    // The same µF within the tolerance printed on the old can, commonly ±5 % or ±6 % (common practice).
    const off = f.microfarads.map((o, i) => ({ o, c: c.microfarads[i]!, i })).filter(({ o, c: v }) => Math.abs(v - o) > (o * f.tolerancePct) / 100 + EPS);
    const exact = f.microfarads.every((o, i) => Math.abs(c.microfarads[i]! - o) < 0.001);
    if (off.length) {
      for (const x of off) reasons.push({ field: 'microfarads', text: `${sectionName(x.i, n)}${num(x.c)} µF is more than ±${f.tolerancePct} % from the old ${num(x.o)} µF.` });
    } else if (exact) matches.push({ field: 'microfarads', text: `${sections(c.microfarads)}, like the old one.` });
    else differs.push({ field: 'microfarads', text: `${sections(c.microfarads)} against the old ${sections(f.microfarads)}: within ±${f.tolerancePct} %.` });
  }

  // An equal or higher voltage rating is fine, a lower one is not (common practice).
  if (c.volts === f.volts) matches.push({ field: 'volts', text: `${c.volts} V, like the old one.` });
  else if (c.volts > f.volts) matches.push({ field: 'volts', text: `${c.volts} V, above the old ${f.volts} V: fine.` });
  else reasons.push({ field: 'volts', text: `${c.volts} V, below the old capacitor's ${f.volts} V.` });

  // Shape only decides whether it fits the bracket.
  if (f.shape) {
    if (c.shape === f.shape) matches.push({ field: 'shape', text: `${c.shape === 'round' ? 'Round' : 'Oval'}, like the old one.` });
    else {
      differs.push({ field: 'shape', text: `${c.shape === 'round' ? 'Round' : 'Oval'}; the old one is ${f.shape}.` });
      needs.push(`Check that the ${c.shape} can fits the bracket, or strap it.`);
    }
  }
  if (n === 2) needs.push('Move the wires terminal for terminal: HERM to the compressor, FAN to the fan motor, C to common.');
  return { reasons, matches, differs, needs };
}

// ---- The search ----

function sortKey(place: Place, differs: number, c: PartCandidate): [number, number, string, string] {
  return [PLACE_ORDER.indexOf(place), differs, c.sku, c.location?.name ?? ''];
}
function byKey<T>(key: (x: T) => [number, number, string, string]) {
  return (a: T, b: T) => {
    const ka = key(a);
    const kb = key(b);
    return ka[0] - kb[0] || ka[1] - kb[1] || ka[2].localeCompare(kb[2]) || ka[3].localeCompare(kb[3]);
  };
}

/**
 * The stocked parts that can replace the failed one: this truck first, then other trucks, then
 * the shop, then parts to order; the closest matches first within each. Candidates of another
 * category are left out; the rest that do not fit are listed with the reasons.
 */
export function findReplacements(input: { failed: FailedMotor | FailedCapacitor; candidates: PartCandidate[]; thisTruckId: string | null }): ReplacementResult {
  const { failed } = input;
  const fits: ReplacementFit[] = [];
  const refused: ReplacementRefusal[] = [];
  for (const cand of input.candidates) {
    if (cand.spec ? cand.spec.category !== failed.category : false) continue;
    const place = placeOf(cand, input.thisTruckId);
    if (!cand.spec) {
      refused.push({ candidate: cand, place, reasons: [{ field: 'spec', text: 'No specification recorded: add it in the price book to match this part.' }], matches: [] });
      continue;
    }
    const m = failed.category === 'motor' ? matchMotor(failed, cand.spec as MotorSpec) : { ...matchCapacitor(failed, cand.spec as CapacitorSpec), capacitor: null };
    if (cand.location && cand.quantity < 1) m.reasons.push({ field: 'stock', text: `None left at ${cand.location.name}.` });
    if (m.reasons.length) {
      refused.push({ candidate: cand, place, reasons: m.reasons, matches: m.matches });
      continue;
    }
    if (place === 'order') m.needs.unshift('Not stocked anywhere: order it and book a visit to fit it.');
    else if (place === 'other_truck') m.needs.unshift(`Get it from ${cand.location!.name}.`);
    else if (place === 'shop') m.needs.unshift('Pick it up at the shop.');
    let capacitor: ReplacementFit['capacitor'] = null;
    if (m.capacitor) {
      const caps = findReplacements({
        failed: { category: 'capacitor', microfarads: [m.capacitor.microfarads], volts: m.capacitor.volts, shape: null, tolerancePct: DEFAULT_CAPACITOR_TOLERANCE_PCT },
        candidates: input.candidates.filter((c) => c.spec?.category === 'capacitor'),
        thisTruckId: input.thisTruckId,
      });
      capacitor = { ...m.capacitor, fits: caps.fits };
    }
    fits.push({ candidate: cand, place, matches: m.matches, differs: m.differs, needs: m.needs, capacitor });
  }
  fits.sort(byKey((f) => sortKey(f.place, f.differs.length, f.candidate)));
  refused.sort(byKey((r) => sortKey(r.place, r.reasons.length, r.candidate)));
  return { fits, refused };
}
