import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { CURRENCY_CODES, dineroDecimal, dineroSum, formatMinor, minorToDecimal, moneyOf, sumMinor } from '@/features/pricing';

describe('money', () => {
  it('the fast decimal of minor units equals dinero toDecimal, in every currency (property)', () => {
    fc.assert(
      fc.property(fc.integer({ min: 0, max: Number.MAX_SAFE_INTEGER }), fc.constantFrom(...CURRENCY_CODES), (amount, code) => {
        expect(minorToDecimal(amount, code)).toBe(dineroDecimal(amount, code));
      }),
      { numRuns: 1000 },
    );
  });

  it('sums minor units exactly as dinero add does (property)', () => {
    fc.assert(
      fc.property(fc.array(fc.integer({ min: 0, max: 1_000_000_000 }), { maxLength: 50 }), fc.constantFrom(...CURRENCY_CODES), (amounts, code) => {
        expect(sumMinor(amounts)).toBe(dineroSum(amounts, code));
      }),
    );
  });

  it('refuses a total beyond the exact integer range', () => {
    expect(() => sumMinor([Number.MAX_SAFE_INTEGER, 1])).toThrow(RangeError);
  });

  it('formats USD, EUR, GBP and JPY from integer minor units', () => {
    expect(moneyOf(123456, 'USD')).toEqual({ amountMinor: 123456, currency: 'USD', decimal: '1234.56', formatted: '$1,234.56' });
    expect(formatMinor(5, 'USD')).toBe('$0.05');
    expect(formatMinor(123456, 'EUR', 'de-DE')).toBe('1.234,56\u00a0€');
    expect(formatMinor(123456, 'GBP', 'en-GB')).toBe('£1,234.56');
    expect(moneyOf(1234, 'JPY').decimal).toBe('1234');
    expect(formatMinor(1234, 'JPY', 'en-US')).toBe('¥1,234');
  });

  it('refuses a non-integer amount', () => {
    expect(() => moneyOf(1.5, 'USD')).toThrow(RangeError);
  });
});
