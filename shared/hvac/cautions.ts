import { A2L_REFRIGERANTS } from './refrigerant-names';

export interface Caution {
  id: string;
  title: string;
  text: string;
  /** Shown to technicians, homeowners, or both. */
  audience: readonly ('technician' | 'homeowner')[];
}

/** Short, firm cautions. Local codes and licensed practice always come first. */
export const cautions: readonly Caution[] = [
  {
    id: 'gas_or_co_emergency',
    title: 'Gas smell or carbon monoxide alarm',
    text: 'Leave the house now, then call the gas utility or emergency services from outside. Do not switch lights or appliances on or off. Follow local emergency guidance.',
    audience: ['homeowner', 'technician'],
  },
  {
    id: 'refrigerant_certification',
    title: 'Refrigerant work needs certification',
    text: 'Connecting gauges, adding or recovering refrigerant requires EPA Section 608 certification in the United States. Follow local codes and licensed practice.',
    audience: ['technician'],
  },
  {
    id: 'electrical_power_and_capacitors',
    title: 'Disconnect power and discharge capacitors',
    text: 'Turn off and lock out power and prove it is off before touching wiring. Capacitors hold a charge after power is off: discharge them safely before handling. Follow local electrical codes and licensed practice.',
    audience: ['technician'],
  },
  {
    id: 'fuel_burning_equipment',
    title: 'Fuel-burning equipment and carbon monoxide',
    text: 'Furnaces and other fuel-burning equipment can release carbon monoxide if venting or combustion is faulty. Test for carbon monoxide on every heating visit, and shut down any unsafe appliance. Local gas codes and licensed practice apply.',
    audience: ['technician'],
  },
  {
    // Hazard levels: ANSI Z21.47 flue limit and the EPA's ambient CO standard (see evaluate.ts).
    id: 'co_hazard',
    title: 'Hazardous carbon monoxide reading',
    text: 'Stop. Shut the appliance off and make it safe before anything else: ventilate, get people out of the affected space if the living-space reading is high, and do not leave the appliance running until the cause is found and fixed. Tell the homeowner in writing. Follow local codes and licensed practice, and call the gas utility or emergency services where they require it.',
    audience: ['technician'],
  },
  {
    // ASHRAE Standard 34 safety class A2L (lower flammability); UL 60335-2-40 for equipment using them.
    id: 'a2l_refrigerants',
    title: 'A2L refrigerant (R-32, R-454B)',
    text: "R-32 and R-454B are mildly flammable, safety class A2L in ASHRAE Standard 34. Use recovery machines, vacuum pumps and leak detectors rated for A2L refrigerants, keep ignition sources away from the work and ventilate, and follow the equipment's UL 60335-2-40 markings and the manufacturer's instructions. Local codes and licensed practice apply.",
    audience: ['technician'],
  },
  {
    // U.S. Consumer Product Safety Commission: test CO alarms monthly.
    id: 'co_alarms',
    title: 'Carbon monoxide alarms',
    text: 'Keep working carbon monoxide alarms near sleeping areas and on each level of a home with fuel-burning equipment, as local codes require. Test them once a month and replace the batteries as the maker says (U.S. Consumer Product Safety Commission advice).',
    audience: ['homeowner'],
  },
  {
    id: 'homeowner_no_panels',
    title: 'Leave panels closed',
    text: 'Equipment panels hide high voltage, moving parts and hot surfaces. Changing a filter is fine; leave the rest to a licensed technician.',
    audience: ['homeowner'],
  },
];

/**
 * The technician's cautions for a visit, by what the equipment involves: refrigerant work,
 * A2L refrigerants, fuel-burning equipment. The hazardous-CO caution is shown by the reading
 * that calls for it.
 */
export function technicianCautionsFor(i: { fuelBurning: boolean; hasRefrigerant: boolean; refrigerants?: readonly string[] }): Caution[] {
  const a2l = (i.refrigerants ?? []).some((r) => (A2L_REFRIGERANTS as readonly string[]).includes(r));
  return cautions.filter((c) => {
    if (!c.audience.includes('technician')) return false;
    if (c.id === 'refrigerant_certification') return i.hasRefrigerant;
    if (c.id === 'fuel_burning_equipment') return i.fuelBurning;
    if (c.id === 'a2l_refrigerants') return a2l;
    if (c.id === 'co_hazard') return i.fuelBurning;
    return true;
  });
}
