import type { Equipment } from '../../../../shared/schemas/equipment';

/** The icon beside an equipment's expected-life word, for the office and the homeowner alike. */
export const LIFE_ICON: Record<Equipment['life']['status'], string> = { unknown: 'info', ok: 'status-ok', nearing: 'status-watch', past: 'status-alert' };
/** The icon beside an equipment's warranty word. */
export const WARRANTY_ICON: Record<Equipment['warranty'], string> = { unknown: 'info', active: 'shield', ending_soon: 'status-watch', expired: 'status-alert' };
