import { describe, expect, it } from 'vitest';
import { formatPhone, phoneHref } from '../shared/phone';

describe('phone numbers as people read them', () => {
  it('writes a US number in the national format for a US company', () => {
    // North American Numbering Plan display "(NPA) NXX-XXXX" (libphonenumber-js formatNational).
    expect(formatPhone('+18165550142', 'US')).toBe('(816) 555-0142');
  });

  it('writes a number from another country in the international format', () => {
    // UK London numbers "+44 20 XXXX XXXX" (libphonenumber-js formatInternational).
    expect(formatPhone('+442079460018', 'US')).toBe('+44 20 7946 0018');
  });

  it('leaves text that is no phone number as it was, and gives it no link', () => {
    expect(formatPhone('call the office', 'US')).toBe('call the office');
    expect(phoneHref('call the office', 'US')).toBeNull();
  });

  it('links to the global number', () => {
    // RFC 3966 tel URI: the E.164 number with its leading "+".
    expect(phoneHref('+18165550142', 'US')).toBe('tel:+18165550142');
  });
});
