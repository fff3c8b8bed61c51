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
    id: 'co_alarms',
    title: 'Carbon monoxide alarms',
    text: 'Keep working carbon monoxide alarms near sleeping areas and on each level of a home with fuel-burning equipment, as local codes require.',
    audience: ['homeowner'],
  },
  {
    id: 'homeowner_no_panels',
    title: 'Leave panels closed',
    text: 'Equipment panels hide high voltage, moving parts and hot surfaces. Changing a filter is fine; leave the rest to a licensed technician.',
    audience: ['homeowner'],
  },
];
