import { minorDigits, showMoney, toMajor, toMinor } from './money';

describe('money in minor units', () => {
  it('knows the decimals of each currency from ISO 4217 as the browser has them', () => {
    expect(minorDigits('EUR')).toBe(2);
    expect(minorDigits('JPY')).toBe(0);
    expect(minorDigits('KWD')).toBe(3);
  });

  it('turns typed amounts into whole minor units and back', () => {
    expect(toMinor(12.5, 'EUR')).toBe(1250);
    // 0.1 + 0.2 is not 0.3 in binary floating point; rounding keeps the cents right
    expect(toMinor(0.1 + 0.2, 'EUR')).toBe(30);
    expect(toMinor(1200, 'JPY')).toBe(1200);
    expect(toMajor(1250, 'EUR')).toBe(12.5);
  });

  it('shows an amount with its currency', () => {
    expect(showMoney(2350, 'EUR')).toBe('€23.50');
  });
});
