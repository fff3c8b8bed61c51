import { navigationFor } from './navigation';

describe('navigationFor', () => {
  it('shows nothing to someone signed out', () => {
    expect(navigationFor(null)).toEqual([]);
  });

  it('keeps office staff out of settings and gives the owner everything', () => {
    expect(navigationFor('office').map((l) => l.path)).not.toContain('/admin');
    expect(navigationFor('owner').map((l) => l.path)).toEqual(expect.arrayContaining(['/office', '/field', '/admin']));
  });
});
