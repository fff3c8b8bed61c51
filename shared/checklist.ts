// Checklist results and reading names, for screens.
// No zod here, so the client can use these without the validator; the API contract in shared/schemas/ builds on them.

export const CHECKLIST_RESULTS = ['done', 'needs_attention', 'not_applicable'] as const;

export type ChecklistResult = (typeof CHECKLIST_RESULTS)[number];

export const CHECKLIST_RESULT_LABELS: Record<ChecklistResult, string> = {
  done: 'Done',
  needs_attention: 'Needs attention',
  not_applicable: 'Not applicable',
};

/** Short names for each reading check, for charts and lists. */
export const CHECK_LABELS: Readonly<Record<string, string | undefined>> = {
  temperature_split: 'Temperature split',
  temperature_rise: 'Temperature rise',
  superheat: 'Superheat',
  subcooling: 'Subcooling',
  capacitor_compressor: 'Compressor capacitor',
  capacitor_outdoor_fan: 'Outdoor fan capacitor',
  capacitor_blower: 'Blower capacitor',
  amps_compressor: 'Compressor amps',
  amps_outdoor_fan: 'Outdoor fan amps',
  amps_blower: 'Blower amps',
  control_voltage: 'Control voltage',
  sensible_capacity: 'Sensible capacity',
  airflow_per_ton: 'Airflow per ton',
  external_static_pressure: 'Total external static pressure',
  co_flue_air_free: 'Flue CO (air-free)',
  co_ambient: 'Living-space CO',
};
