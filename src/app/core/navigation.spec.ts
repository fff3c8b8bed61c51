import { navigationFor } from './navigation';

describe('navigationFor', () => {
  it('shows nothing to someone signed out', () => {
    expect(navigationFor(null)).toEqual([]);
  });

  it('keeps office staff out of settings and gives the owner everything', () => {
    expect(navigationFor('office').map((l) => l.path)).not.toContain('/admin');
    expect(navigationFor('owner').map((l) => l.path)).toEqual(expect.arrayContaining(['/office', '/field', '/admin']));
  });

  it("puts the office's rarer pages under More, for the office and the owner alike", () => {
    for (const role of ['office', 'owner'] as const) {
      const more = navigationFor(role)
        .filter((l) => l.more)
        .map((l) => l.path);
      expect(more).toEqual(expect.arrayContaining(['/office/reports', '/office/invite']));
      expect(more).not.toContain('/office/customers');
    }
  });
});
