import { EQUIPMENT_KINDS, type EquipmentKind } from '../equipment';
import { SeasonInputError, seasonOf, type Season, type SeasonSettings } from '../seasons';
import { ReadingInputError } from './errors';

// One list of equipment kinds and one season table for the whole product.
export { EQUIPMENT_KINDS, type EquipmentKind, type Season };

export interface ChecklistItem {
  /** Stable across releases: saved visit results refer to it. */
  id: string;
  text: string;
  /** Seasons the item belongs to. */
  seasons: readonly Season[];
}

const BOTH: readonly Season[] = ['cooling', 'heating'];
const COOL: readonly Season[] = ['cooling'];
const HEAT: readonly Season[] = ['heating'];

// Written from common practice within the scope of residential maintenance
// inspection in ANSI/ACCA 4 QM; local codes and the manufacturer's instructions come first.
// Every appliance that is opened starts with power off and locked out, in every season.
const CHECKLISTS: Record<EquipmentKind, readonly ChecklistItem[]> = {
  condensing_unit: [
    { id: 'cu.power_off_verified', text: 'Lock out the outdoor disconnect and prove power is off before opening panels', seasons: BOTH },
    { id: 'cu.coil_clean', text: 'Rinse the outdoor coil from the inside out; straighten bent fins', seasons: COOL },
    { id: 'cu.clearance', text: 'Clear plants and debris to keep open space around the unit', seasons: COOL },
    { id: 'cu.level_pad', text: 'Check the unit sits level on its pad or brackets', seasons: COOL },
    { id: 'cu.contactor', text: 'Inspect contactor points for pitting and burning', seasons: COOL },
    { id: 'cu.capacitor', text: 'Discharge and test run capacitors against their printed rating', seasons: COOL },
    { id: 'cu.wiring', text: 'Tighten electrical connections; look for heat-darkened insulation', seasons: COOL },
    { id: 'cu.fan_motor', text: 'Check the fan blade for cracks and wobble; measure fan motor amps', seasons: COOL },
    { id: 'cu.compressor_amps', text: 'Measure compressor running amps against the nameplate', seasons: COOL },
    { id: 'cu.charge', text: 'Check refrigerant charge by superheat or subcooling, per the metering device', seasons: COOL },
    { id: 'cu.line_set', text: 'Inspect line set insulation and look for oil stains that point to a leak', seasons: COOL },
    { id: 'cu.service_valves', text: 'Confirm service valve caps are in place and snug', seasons: COOL },
  ],
  heat_pump: [
    { id: 'hp.power_off_verified', text: 'Lock out the outdoor disconnect and prove power is off before opening panels', seasons: BOTH },
    { id: 'hp.coil_clean', text: 'Rinse the outdoor coil from the inside out; straighten bent fins', seasons: BOTH },
    { id: 'hp.clearance', text: 'Clear debris, snow and ice from around and under the unit', seasons: BOTH },
    { id: 'hp.capacitor', text: 'Discharge and test run capacitors against their printed rating', seasons: BOTH },
    { id: 'hp.contactor_wiring', text: 'Inspect the contactor and tighten electrical connections', seasons: BOTH },
    { id: 'hp.compressor_amps', text: 'Measure compressor and fan motor amps against the nameplate', seasons: BOTH },
    { id: 'hp.charge_cooling', text: 'Check refrigerant charge in cooling by superheat or subcooling', seasons: COOL },
    { id: 'hp.reversing_valve', text: 'Switch between modes and confirm the reversing valve shifts fully', seasons: HEAT },
    { id: 'hp.defrost', text: 'Run a defrost cycle and confirm it starts and ends on its own', seasons: HEAT },
    { id: 'hp.aux_heat', text: 'Confirm auxiliary and emergency heat strips come on and draw current', seasons: HEAT },
    { id: 'hp.drainage', text: 'Check that defrost water drains away and the unit is raised above snow line', seasons: HEAT },
  ],
  air_handler: [
    { id: 'ah.power_off_verified', text: 'Turn off and lock out power at the air handler and prove it is off before opening panels', seasons: BOTH },
    { id: 'ah.filter', text: 'Replace or clean the air filter; note its size and rating', seasons: BOTH },
    { id: 'ah.blower', text: 'Inspect the blower wheel for dirt build-up; measure blower motor amps', seasons: BOTH },
    { id: 'ah.evaporator', text: 'Inspect the indoor coil face for dirt and clean as needed', seasons: COOL },
    { id: 'ah.condensate_drain', text: 'Flush the condensate drain and trap; confirm flow to its outlet', seasons: COOL },
    // Overflow protection for a cooling coil: IMC 307.2.3 (secondary pan, overflow line or water-level switch).
    { id: 'ah.condensate_switch', text: 'Test the condensate switch: it must stop cooling when tripped', seasons: COOL },
    { id: 'ah.drain_pan', text: 'Check the primary and secondary drain pans for rust and standing water', seasons: COOL },
    { id: 'ah.split', text: 'Measure return and supply temperatures for the temperature split', seasons: COOL },
    { id: 'ah.airflow', text: 'Measure total static pressure and estimate airflow', seasons: BOTH },
    { id: 'ah.duct_connections', text: 'Look for air leaks at the cabinet and duct connections', seasons: BOTH },
    { id: 'ah.heat_strips', text: 'Test electric heat strips and their limit switches', seasons: HEAT },
  ],
  gas_furnace: [
    { id: 'gf.power_gas_off', text: 'Turn off and lock out power, and turn off the gas valve, before opening the furnace', seasons: BOTH },
    { id: 'gf.filter', text: 'Replace or clean the air filter', seasons: BOTH },
    { id: 'gf.venting', text: 'Inspect the vent and combustion air pipes for damage, blockage and slope', seasons: HEAT },
    { id: 'gf.heat_exchanger', text: 'Inspect the heat exchanger for cracks, rust-through and flame disturbance', seasons: HEAT },
    { id: 'gf.burners', text: 'Clean burners and check for a steady, even flame', seasons: HEAT },
    { id: 'gf.flame_sensor', text: 'Clean the flame sensor and measure its signal', seasons: HEAT },
    { id: 'gf.igniter', text: 'Inspect the igniter for cracks and check ignition timing', seasons: HEAT },
    { id: 'gf.gas_pressure', text: 'Measure manifold gas pressure against the nameplate', seasons: HEAT },
    { id: 'gf.temperature_rise', text: 'Measure temperature rise against the nameplate range', seasons: HEAT },
    { id: 'gf.safeties', text: 'Test the limit, rollout and pressure switches', seasons: HEAT },
    { id: 'gf.co_test', text: 'Test flue gas and the living space for carbon monoxide', seasons: HEAT },
    { id: 'gf.condensate', text: 'Flush the condensate trap and drain on high-efficiency models', seasons: HEAT },
    { id: 'gf.gas_leaks', text: 'Check gas piping and fittings at the appliance for leaks', seasons: HEAT },
    { id: 'gf.blower_cooling', text: 'Clean the blower and check its amps before the cooling season', seasons: COOL },
  ],
  geothermal_heat_pump: [
    { id: 'gt.power_off_verified', text: 'Turn off and lock out power and prove it is off before opening panels', seasons: BOTH },
    { id: 'gt.filter', text: 'Replace or clean the air filter', seasons: BOTH },
    { id: 'gt.loop_temps', text: 'Record entering and leaving loop water temperatures', seasons: BOTH },
    { id: 'gt.loop_pressure', text: 'Check loop pressure and flow against the design values', seasons: BOTH },
    { id: 'gt.antifreeze', text: 'Test antifreeze freeze protection in closed loops', seasons: HEAT },
    { id: 'gt.flow_center', text: 'Listen for noisy pumps and check the flow centre for leaks', seasons: BOTH },
    { id: 'gt.condensate', text: 'Flush the condensate drain and test the condensate switch', seasons: COOL },
    { id: 'gt.compressor_amps', text: 'Measure compressor and blower amps against the nameplate', seasons: BOTH },
    { id: 'gt.aux_heat', text: 'Confirm auxiliary heat comes on when called', seasons: HEAT },
    { id: 'gt.desuperheater', text: 'Check the hot water desuperheater pump, if fitted', seasons: BOTH },
  ],
  ductless: [
    { id: 'dl.power_off_verified', text: 'Turn off and lock out power at the outdoor disconnect and prove it is off', seasons: BOTH },
    { id: 'dl.filters', text: 'Wash the indoor unit filters and let them dry before refitting', seasons: BOTH },
    { id: 'dl.indoor_coil', text: 'Clean the indoor coil and blower wheel', seasons: COOL },
    { id: 'dl.condensate', text: 'Flush the indoor unit drain and check the drain line outside', seasons: COOL },
    {
      id: 'dl.condensate_pump',
      text: "Where a pump lifts the indoor unit's water: unplug it, clean it, then test that it runs and its overflow switch stops cooling",
      seasons: COOL,
    },
    { id: 'dl.outdoor_coil', text: 'Rinse the outdoor coil and clear debris, snow and ice', seasons: BOTH },
    { id: 'dl.line_set', text: 'Inspect line set insulation and the wall sleeve', seasons: BOTH },
    { id: 'dl.operation', text: 'Run each indoor head in the season mode and check the split', seasons: BOTH },
    { id: 'dl.remote', text: 'Check the remote or wall control and replace batteries', seasons: BOTH },
  ],
  thermostat: [
    { id: 'ts.power_off', text: 'Switch the system off at its disconnect before taking the thermostat off its base; restore power for the voltage and cycle tests', seasons: BOTH },
    { id: 'ts.calibration', text: 'Compare the displayed temperature with a reference thermometer', seasons: BOTH },
    { id: 'ts.batteries', text: 'Replace batteries where used', seasons: BOTH },
    { id: 'ts.wiring', text: 'Check wiring at the base for loose or corroded terminals', seasons: BOTH },
    { id: 'ts.control_voltage', text: 'Measure 24 VAC control voltage at the thermostat', seasons: BOTH },
    { id: 'ts.cycle_cooling', text: 'Call for cooling and confirm the system starts and stops', seasons: COOL },
    { id: 'ts.cycle_heating', text: 'Call for heating and confirm the system starts and stops', seasons: HEAT },
    { id: 'ts.schedule', text: 'Review the schedule and settings with the homeowner', seasons: BOTH },
  ],
  condensate_pump: [
    { id: 'cp.power_off', text: 'Unplug the pump before cleaning', seasons: BOTH },
    { id: 'cp.reservoir', text: 'Clean the reservoir and float of sludge and algae', seasons: BOTH },
    { id: 'cp.float_switch', text: 'Lift the float: the pump must run and the overflow switch must stop the equipment', seasons: BOTH },
    { id: 'cp.check_valve', text: 'Confirm the check valve keeps water from running back', seasons: BOTH },
    { id: 'cp.discharge_line', text: 'Check the discharge line is clear and ends where water can drain', seasons: BOTH },
  ],
  humidifier: [
    { id: 'hu.water_off', text: 'Turn off and lock out power, and turn off the water, before servicing the humidifier', seasons: BOTH },
    { id: 'hu.pad', text: 'Replace the water panel or pad and clean mineral build-up', seasons: HEAT },
    { id: 'hu.solenoid', text: 'Confirm the water valve opens on a call and closes after', seasons: HEAT },
    { id: 'hu.drain', text: 'Check the drain line runs freely', seasons: HEAT },
    { id: 'hu.humidistat', text: 'Set the humidity control for the season and outdoor temperature', seasons: HEAT },
    { id: 'hu.bypass_damper', text: 'Open the bypass damper for heating', seasons: HEAT },
    { id: 'hu.summer_off', text: 'Close the bypass damper and shut off water for the cooling season', seasons: COOL },
  ],
  air_cleaner: [
    { id: 'ac.power_off', text: 'Turn off power before opening an electronic or UV air cleaner', seasons: BOTH },
    { id: 'ac.media', text: 'Replace the media filter or wash the electronic cells', seasons: BOTH },
    { id: 'ac.seal', text: 'Check the cabinet door and gaskets seal so air cannot bypass', seasons: BOTH },
    { id: 'ac.uv_lamp', text: 'Check UV lamps light and replace them on their service interval', seasons: BOTH },
    { id: 'ac.indicator', text: 'Confirm the power or service indicator works', seasons: BOTH },
  ],
};

/**
 * A furnace's cased indoor coil, with an outdoor condensing unit: the commonest system. The coil
 * sits on the furnace, so its cooling-season items go with the furnace.
 */
const CASED_COIL: readonly ChecklistItem[] = [
  { id: 'gf.coil', text: 'Inspect the cased indoor coil on the furnace for dirt and clean as needed', seasons: COOL },
  { id: 'gf.coil_drain', text: "Flush the coil's condensate drain and trap; confirm flow to its outlet", seasons: COOL },
  // IMC 307.2.3: auxiliary drain pan, overflow drain line or water-level detection device for each cooling coil.
  { id: 'gf.coil_overflow', text: 'Check the secondary drain pan or line, or test the overflow switch: it must stop cooling when water backs up (IMC 307.2.3)', seasons: COOL },
];

export interface ChecklistOptions {
  /** The furnace carries a cased cooling coil (an outdoor condensing unit or heat pump, no separate air handler). */
  casedCoil?: boolean;
}

/** Outdoor units that pair with a cased coil on a furnace. */
const SPLIT_OUTDOOR: ReadonlySet<string> = new Set(['condensing_unit', 'heat_pump']);

/** Whether a furnace at a home with these kinds of equipment carries a cased cooling coil. */
export function furnaceHasCasedCoil(kinds: readonly string[]): boolean {
  return kinds.includes('gas_furnace') && kinds.some((k) => SPLIT_OUTDOOR.has(k)) && !kinds.includes('air_handler');
}

/** Tune-up items for one kind of equipment in one season, in working order. */
export function tuneUpChecklist(kind: EquipmentKind, season: Season, options: ChecklistOptions = {}): ChecklistItem[] {
  const items = (CHECKLISTS as Record<string, readonly ChecklistItem[] | undefined>)[kind];
  if (!items) throw new ReadingInputError('kind', `unknown equipment kind "${String(kind)}"; expected one of ${EQUIPMENT_KINDS.join(', ')}`);
  if (season !== 'cooling' && season !== 'heating') {
    throw new ReadingInputError('season', `must be "cooling" or "heating", got "${String(season)}"`);
  }
  let all = items;
  if (kind === 'gas_furnace' && options.casedCoil) {
    // Coil work follows the filter, before the burner-side items.
    const at = items.findIndex((i) => i.id === 'gf.filter') + 1;
    all = [...items.slice(0, at), ...CASED_COIL, ...items.slice(at)];
  }
  return all.filter((i) => i.seasons.includes(season));
}

/** The season of a visit date from the owner's season table (seasons.ts), as coverage and reminders use it. */
export function checklistSeasonOf(onDate: string, seasons?: Partial<SeasonSettings> | null): Season {
  try {
    return seasonOf(onDate, seasons);
  } catch (err) {
    if (err instanceof SeasonInputError) throw new ReadingInputError(err.field === 'date' ? 'onDate' : `seasons.${err.field}`, err.message.replace(/^[^:]+: /, ''));
    throw err;
  }
}

/**
 * The tune-up checklist for a visit date: its season from the one season table, and the items for
 * this kind of equipment, knowing the rest of the home's equipment.
 */
export function tuneUpChecklistOn(
  kind: EquipmentKind,
  onDate: string,
  context: { seasons?: Partial<SeasonSettings> | null; equipmentKinds?: readonly string[] } = {},
): { season: Season; items: ChecklistItem[] } {
  const season = checklistSeasonOf(onDate, context.seasons);
  return { season, items: tuneUpChecklist(kind, season, { casedCoil: furnaceHasCasedCoil(context.equipmentKinds ?? []) }) };
}
