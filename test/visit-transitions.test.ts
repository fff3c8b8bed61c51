import { describe, expect, it } from 'vitest';
import { canTransition, VISIT_STATUSES, VISIT_TRANSITIONS } from '../shared/visits';

describe('visit status transitions', () => {
  it('lists every status, and only known statuses as the next one', () => {
    expect(Object.keys(VISIT_TRANSITIONS).sort()).toEqual([...VISIT_STATUSES].sort());
    for (const next of Object.values(VISIT_TRANSITIONS)) for (const s of next) expect(VISIT_STATUSES).toContain(s);
  });

  it('completes only a visit the technician is on site for', () => {
    expect(canTransition('on_site', 'done')).toBe(true);
    for (const from of ['requested', 'scheduled', 'on_the_way', 'no_show', 'canceled'] as const) expect(canTransition(from, 'done')).toBe(false);
  });

  it('walks a visit from request to done', () => {
    const path = ['requested', 'scheduled', 'on_the_way', 'on_site', 'done'] as const;
    for (let i = 1; i < path.length; i++) expect(canTransition(path[i - 1]!, path[i]!)).toBe(true);
  });

  it('never leaves done or canceled', () => {
    expect(VISIT_TRANSITIONS.done).toEqual([]);
    expect(VISIT_TRANSITIONS.canceled).toEqual([]);
    for (const to of VISIT_STATUSES) {
      expect(canTransition('done', to)).toBe(false);
      expect(canTransition('canceled', to)).toBe(false);
    }
  });

  it('lets a visit go back to the unassigned queue until the technician is on site', () => {
    for (const from of ['scheduled', 'on_the_way', 'no_show'] as const) expect(canTransition(from, 'requested')).toBe(true);
    expect(canTransition('on_site', 'requested')).toBe(false);
  });

  it('cancels only a visit that has not started on site', () => {
    for (const from of ['requested', 'scheduled', 'on_the_way'] as const) expect(canTransition(from, 'canceled')).toBe(true);
    for (const from of ['on_site', 'done', 'no_show'] as const) expect(canTransition(from, 'canceled')).toBe(false);
  });

  it('books a no-show again, and does not count staying put as a transition', () => {
    expect(canTransition('no_show', 'scheduled')).toBe(true);
    for (const s of VISIT_STATUSES) expect(canTransition(s, s)).toBe(false);
  });
});
