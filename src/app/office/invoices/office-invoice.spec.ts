import { dollarsToCents } from './office-invoice';

describe('dollarsToCents', () => {
  it('turns typed dollars into whole cents without floating point', () => {
    // 0.29 × 100 is 28.999… in binary floating point (IEEE 754); the parser must give 29
    expect(dollarsToCents('0.29')).toBe(29);
    expect(dollarsToCents('$1,234.5'.replace(',', ''))).toBe(123450);
    expect(dollarsToCents('  89 ')).toBe(8900);
    expect(dollarsToCents('12.345')).toBeNull();
    expect(dollarsToCents('-5')).toBeNull();
    expect(dollarsToCents('abc')).toBeNull();
  });
});
