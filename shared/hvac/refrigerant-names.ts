// The refrigerants the readings know, by name only: forms list them without the saturation
// tables and psychrometrics in refrigerants.ts, which re-exports them.

export const REFRIGERANTS = ['R-410A', 'R-22', 'R-32', 'R-454B', 'R-407C'] as const;
export type Refrigerant = (typeof REFRIGERANTS)[number];

/**
 * Mildly flammable refrigerants, safety class A2L in ASHRAE Standard 34: equipment, recovery
 * machines and leak detectors must be rated for them (UL 60335-2-40).
 */
export const A2L_REFRIGERANTS: readonly Refrigerant[] = ['R-32', 'R-454B'];

/**
 * Blends whose bubble and dew points differ by several degrees (zeotropic glide): superheat is
 * read from the dew point and subcooling from the bubble point (R-407C's glide is about 10 °F,
 * see data/README.md).
 */
export const HIGH_GLIDE_REFRIGERANTS: readonly Refrigerant[] = ['R-407C'];
