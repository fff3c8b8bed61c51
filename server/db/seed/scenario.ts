// The demo company and its town are invented; so is everyone in them.
export const COMPANY = {
  name: 'Bluestem Comfort Heating & Air',
  phone: '+18165550142',
  email: 'office@bluestem-comfort.test',
  street: '410 Foundry Row',
  city: 'Larkspur Bend',
  state: 'MO',
  zip: '64790',
  timeZone: 'America/Chicago',
  taxRateBps: 825,
  diagnosticFeeCents: 8900,
};

export const DEMO_STAFF_PASSWORD = 'bluestem-demo-staff-2026';

export const STAFF = [
  { email: 'rosalind.okafor@bluestem-comfort.test', name: 'Rosalind Okafor', role: 'owner' },
  { email: 'teo.marchetti@bluestem-comfort.test', name: 'Teo Marchetti', role: 'office' },
  { email: 'june.halvorsen@bluestem-comfort.test', name: 'June Halvorsen', role: 'office' },
  { email: 'marcus.bellweather@bluestem-comfort.test', name: 'Marcus Bellweather', role: 'technician', skills: ['gas_furnace', 'geothermal', 'refrigerant'], truck: 'Truck 1' },
  { email: 'priya.dunmore@bluestem-comfort.test', name: 'Priya Dunmore', role: 'technician', skills: ['gas_furnace', 'refrigerant'], truck: 'Truck 2' },
  { email: 'eli.castellan@bluestem-comfort.test', name: 'Eli Castellan', role: 'technician', skills: ['refrigerant', 'ductless'], truck: 'Truck 3' },
] as const;

/** Households whose homeowners have portal sign-ins in the demo. */
export const DEMO_HOMEOWNERS = [
  { email: 'dana.whitfield@example.test', name: 'Dana Whitfield', household: 'Whitfield household' },
  { email: 'sam.oduya@example.test', name: 'Sam Oduya', household: 'Oduya household' },
] as const;

export const FIRST_NAMES = [
  'Avery',
  'Blair',
  'Corin',
  'Delia',
  'Emmett',
  'Farrah',
  'Gideon',
  'Harlow',
  'Ines',
  'Jasper',
  'Kenna',
  'Lionel',
  'Maren',
  'Nico',
  'Odette',
  'Percy',
  'Quilla',
  'Rafe',
  'Selma',
  'Tobias',
  'Ulla',
  'Vaughn',
  'Wren',
  'Yusuf',
  'Zora',
];
export const LAST_NAMES = [
  'Ashgrove',
  'Brindle',
  'Calloway',
  'Dervish',
  'Elmstead',
  'Fairbairn',
  'Greythorn',
  'Hollis',
  'Iverson',
  'Jessamine',
  'Kettering',
  'Lindqvist',
  'Moorcroft',
  'Nettleton',
  'Ollander',
  'Pembrook',
  'Quenby',
  'Rathbone',
  'Stillwell',
  'Thistlewood',
  'Underhill',
  'Vantongeren',
  'Wexley',
  'Yarrow',
];
export const STREETS = [
  'Sorghum Lane',
  'Meadowlark Drive',
  'Old Mill Road',
  'Bluff View Court',
  'Cottonwood Avenue',
  'Prairie Smoke Way',
  'Kestrel Street',
  'Tallgrass Circle',
  'Hickory Hollow',
  'Limestone Terrace',
  'Switchgrass Path',
  'Quarry Hill Road',
];
export const AREAS = ['North Bend', 'Riverside', 'Old Town', 'Quarry Hill'] as const;
export const MAKES = ['Vellmar', 'Quintaire', 'Brakeson', 'Ardenvale Air', 'Ostlund Thermal', 'Corvane'];
