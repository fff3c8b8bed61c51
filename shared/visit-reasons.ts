// What a homeowner can report when booking.
// No zod here, so the client can use these without the validator; the API contract in shared/schemas/ builds on them.
import type { VisitReason } from './visits';

export const EMERGENCY_SIGNS = ['gas_smell', 'co_alarm', 'burning_smoke', 'sparking'] as const;

export type EmergencySign = (typeof EMERGENCY_SIGNS)[number];

export const EMERGENCY_SIGN_LABELS: Record<EmergencySign, string> = {
  gas_smell: 'I smell gas (rotten eggs)',
  co_alarm: 'A carbon monoxide alarm is sounding',
  burning_smoke: 'I smell burning or see smoke',
  sparking: 'I see sparks or hear arcing at the equipment',
};

/** Symptoms a homeowner can tick, per reason; "other" takes free notes only. */
export const SYMPTOMS: Record<VisitReason, readonly string[]> = {
  no_cooling: ['Outdoor unit is not running', 'Fan runs but air is warm', 'Ice on the copper lines', 'Breaker tripped', 'Thermostat screen is blank'],
  no_heat: ['Furnace does not start', 'Blower runs but air is cold', 'Pilot or burner will not light', 'Short cycles on and off', 'Breaker tripped'],
  tune_up: ['Just the seasonal tune-up', 'Filter is overdue', 'System is older than 10 years'],
  noise: ['Rattling', 'Squealing', 'Banging when it starts', 'Humming or buzzing', 'Clicking without starting'],
  water_leak: ['Water around the indoor unit', 'Drain pan is full', 'Ceiling stain under the attic unit', 'Condensate pump keeps running'],
  thermostat: ['Screen is blank', 'Does not reach the set temperature', 'Runs without being called', 'Wi-Fi or schedule problem'],
  other: [],
};

/** No cooling and no heat are urgent: they may use the held-back share like plan members. */
export const URGENT_REASONS: readonly VisitReason[] = ['no_cooling', 'no_heat'];
