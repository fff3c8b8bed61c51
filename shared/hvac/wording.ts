import type { ReadingCheck } from './evaluate';

const VERDICT: Record<ReadingCheck['status'], string> = {
  ok: 'in the normal range',
  watch: 'worth keeping an eye on; your technician will explain',
  alert: 'outside the normal range; your technician will recommend what to do next',
};

const whole = (x: number): string => String(Math.round(x));

function describe(c: ReadingCheck): { topic: string; reading: string } {
  switch (c.check) {
    case 'temperature_split':
      return {
        topic: 'Cooling check',
        reading: `the air leaving your system is ${whole(c.value)} °F cooler than the air going in`,
      };
    case 'temperature_rise':
      return {
        topic: 'Heating check',
        reading: `your furnace warms the air passing through it by ${whole(c.value)} °F`,
      };
    case 'superheat':
    case 'subcooling':
      return { topic: 'Refrigerant check', reading: 'the refrigerant charge reading is' };
    case 'capacitor_compressor':
    case 'capacitor_outdoor_fan':
    case 'capacitor_blower':
      return {
        topic: 'Electrical check',
        reading: `the capacitor that helps the ${c.check === 'capacitor_compressor' ? 'compressor' : c.check === 'capacitor_blower' ? 'indoor fan' : 'outdoor fan'} start and run is`,
      };
    case 'amps_compressor':
    case 'amps_outdoor_fan':
    case 'amps_blower':
      return {
        topic: 'Electrical check',
        reading: `the power drawn by the ${c.check === 'amps_compressor' ? 'compressor' : c.check === 'amps_blower' ? 'indoor fan' : 'outdoor fan'} is`,
      };
    case 'control_voltage':
      return { topic: 'Thermostat wiring check', reading: 'the low-voltage power to your thermostat is' };
    case 'sensible_capacity':
      return {
        topic: 'Cooling output check',
        reading: `your system is removing about ${(Math.round(c.value / 100) * 100).toLocaleString('en-US')} Btu of heat per hour from the air, which is`,
      };
    case 'airflow_per_ton':
      return { topic: 'Airflow check', reading: 'the amount of air moving through your system is' };
    case 'external_static_pressure':
      return { topic: 'Airflow check', reading: 'the resistance your ducts and filter put in the way of the air is' };
    case 'co_flue_air_free':
      return { topic: 'Combustion safety check', reading: "the carbon monoxide in your furnace's exhaust is" };
    case 'co_ambient':
      return { topic: 'Carbon monoxide check', reading: 'the carbon monoxide in your living space is' };
    default:
      return { topic: 'System check', reading: 'this reading is' };
  }
}

/** The same check in plain words for the homeowner. */
export function homeownerWording(check: ReadingCheck): string {
  const { topic, reading } = describe(check);
  const e = check.expected;
  // No band means the check is waiting on a label detail or another method, not failing.
  if (e.min === undefined && e.max === undefined && e.target === undefined) {
    return `${topic}: your technician recorded this reading and needs more to judge it, such as a detail from the equipment's label or a different test.`;
  }
  // Readings that end in "is" read on straight into the verdict; the others need a comma.
  const joiner = reading.endsWith(' is') ? ' ' : ', ';
  return `${topic}: ${reading}${joiner}${VERDICT[check.status]}.`;
}
