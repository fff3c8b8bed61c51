import { describe, expect, it } from 'vitest';
import { COMMON_PASSWORDS, isCommonPassword, passwordProblem } from '../shared/passwords/common';

describe('common-password list', () => {
  it('holds thousands of entries', () => {
    expect(COMMON_PASSWORDS.size).toBeGreaterThan(5000);
  });

  it.each([
    'password1234', // "password" plus digits tops every published list (from memory)
    'qwertyuiop12', // keyboard row walk (common practice)
    'Password2026!', // word + year + symbol (common practice)
    'P@ssw0rd1234', // leetspeak of "password" (from memory)
    '1qaz2wsx3edc', // keyboard column walk (common practice)
    'aaaaaaaaaaaa', // one character repeated
    '123456789012', // counting up (from memory)
    'iloveyou2024', // phrase on the published lists plus a year (from memory)
    'abcabcabcabc', // a short unit repeated
  ])('refuses %s', (pw) => {
    expect(isCommonPassword(pw)).toBe(true);
    expect(passwordProblem(pw)).toMatch(/too common/);
  });

  it.each(['furnace lantern orchard', 'blue-kettle-31-harbor', 'Tallgrass&Limestone'])('accepts %s (no composition rules)', (pw) => {
    expect(passwordProblem(pw)).toBeNull();
  });

  it('refuses anything under 12 characters first, counting characters not bytes', () => {
    expect(passwordProblem('short-pass1')).toMatch(/at least 12/);
    expect(passwordProblem('ñandú-kettle')).toBeNull(); // 12 characters, 14 bytes
  });
});
