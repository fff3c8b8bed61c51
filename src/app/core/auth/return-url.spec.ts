import { afterSignIn, safeReturnUrl } from './return-url';

describe('return URL after sign-in', () => {
  it('accepts only same-site paths (OWASP Unvalidated Redirects cheat sheet)', () => {
    expect(safeReturnUrl('/portal/visits')).toBe('/portal/visits');
    expect(safeReturnUrl('//evil.example/x')).toBeNull();
    expect(safeReturnUrl('/\\evil.example')).toBeNull();
    expect(safeReturnUrl('https://evil.example')).toBeNull();
    expect(safeReturnUrl(undefined)).toBeNull();
  });

  it('sends each role to a return URL it may see, else to its own area', () => {
    expect(afterSignIn('homeowner', '/portal/visits')).toBe('/portal/visits');
    expect(afterSignIn('homeowner', '/admin')).toBe('/portal');
    expect(afterSignIn('technician', '/office')).toBe('/field');
    expect(afterSignIn('owner', '/field')).toBe('/field');
    expect(afterSignIn('office', '/profile')).toBe('/profile');
    expect(afterSignIn('office', null)).toBe('/office');
  });
});
