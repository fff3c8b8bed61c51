export const VISIT_KINDS = ['tune_up', 'service_call'] as const;
export type VisitKind = (typeof VISIT_KINDS)[number];

export const VISIT_REASONS = ['no_cooling', 'no_heat', 'tune_up', 'noise', 'water_leak', 'thermostat', 'other'] as const;
export type VisitReason = (typeof VISIT_REASONS)[number];

export const VISIT_REASON_LABELS: Record<VisitReason, string> = {
  no_cooling: 'No cooling',
  no_heat: 'No heat',
  tune_up: 'Tune-up',
  noise: 'Strange noise',
  water_leak: 'Water leak',
  thermostat: 'Thermostat problem',
  other: 'Something else',
};

export const VISIT_STATUSES = ['requested', 'scheduled', 'on_the_way', 'on_site', 'done', 'canceled', 'no_show'] as const;
export type VisitStatus = (typeof VISIT_STATUSES)[number];

export const VISIT_STATUS_LABELS: Record<VisitStatus, string> = {
  requested: 'Requested',
  scheduled: 'Scheduled',
  on_the_way: 'On the way',
  on_site: 'On site',
  done: 'Done',
  canceled: 'Canceled',
  no_show: 'No-show',
};

/**
 * Which status may follow which; anything else is refused. A visit is started by the technician
 * (on the way, then on site) before it can be done. Going back to "requested" returns a visit to
 * the unassigned queue.
 */
export const VISIT_TRANSITIONS: Record<VisitStatus, readonly VisitStatus[]> = {
  requested: ['scheduled', 'canceled'],
  scheduled: ['requested', 'on_the_way', 'on_site', 'canceled', 'no_show'],
  on_the_way: ['requested', 'scheduled', 'on_site', 'canceled', 'no_show'],
  on_site: ['done'],
  done: [],
  canceled: [],
  no_show: ['requested', 'scheduled'],
};

/** True when a visit in `from` may move to `to`. Staying in the same status is not a transition. */
export function canTransition(from: VisitStatus, to: VisitStatus): boolean {
  return VISIT_TRANSITIONS[from].includes(to);
}
