import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import {
  Dec,
  cmpExact,
  exact,
  exactRatioToFixedHalfUp,
  exactToFixedHalfUp,
  exactToString,
  isMultipleExact,
  percentOfMinor,
  ratioToFixedHalfUp,
  roundDivHalfUp,
  roundRatioHalfUp,
  toFixedHalfUp,
} from './decimal';
import { CURRENCY_CODES, currencyExponent, minorToDecimal, moneyOf } from './money';
import { priceQuote } from './pricing';

const decimalText = fc
  .tuple(fc.bigInt({ min: 0n, max: 10n ** 12n }), fc.integer({ min: 0, max: 10 }))
  .map(([digits, places]) => {
    const text = digits.toString().padStart(places + 1, '0');
    return places === 0 ? text : `${text.slice(0, -places)}.${text.slice(-places)}`;
  });
const positiveText = decimalText.filter((t) => /[1-9]/.test(t));

describe('exact decimals agree with decimal.js', () => {
  it('rounds n/d half-up to an integer and to fixed places as the Dec helpers do (property)', () => {
    fc.assert(
      fc.property(decimalText, positiveText, fc.integer({ min: 0, max: 6 }), (n, d, places) => {
        expect(roundRatioHalfUp(exact(n), exact(d)).toString()).toBe(roundDivHalfUp(new Dec(n), new Dec(d)).toFixed());
        expect(exactRatioToFixedHalfUp(exact(n), exact(d), places)).toBe(ratioToFixedHalfUp(new Dec(n), new Dec(d), places));
      }),
      { numRuns: 2000 },
    );
  });

  it('sees an exact half as a half: 12 ozt of 14/24 at 1.005 is 704 cents', () => {
    const centsPerOunce = exact('100.5');
    expect(roundRatioHalfUp({ m: 12n * 14n * centsPerOunce.m, s: centsPerOunce.s }, exact('24'))).toBe(704n);
  });

  it('writes, compares and fixes places as Dec does (property)', () => {
    fc.assert(
      fc.property(decimalText, decimalText, fc.integer({ min: 0, max: 6 }), (a, b, places) => {
        expect(exactToString(exact(a))).toBe(new Dec(a).toFixed());
        expect(exactToFixedHalfUp(exact(a), places)).toBe(toFixedHalfUp(new Dec(a), places));
        expect(cmpExact(exact(a), exact(b))).toBe(new Dec(a).cmp(b));
      }),
      { numRuns: 2000 },
    );
  });

  it('tests whole multiples as Dec mod does (property)', () => {
    fc.assert(
      fc.property(decimalText, fc.constantFrom('0.05', '0.50', '0.25', '1', '0.01'), (a, step) => {
        expect(isMultipleExact(exact(a), exact(step))).toBe(new Dec(a).mod(step).isZero());
      }),
    );
  });

  it('gives percentages of minor units as the Dec ratio does (property)', () => {
    fc.assert(
      fc.property(fc.integer({ min: 0, max: Number.MAX_SAFE_INTEGER }), fc.integer({ min: 1, max: Number.MAX_SAFE_INTEGER }), (part, whole) => {
        expect(percentOfMinor(part, whole)).toBe(ratioToFixedHalfUp(new Dec(part).mul(100), new Dec(whole), 2));
      }),
      { numRuns: 2000 },
    );
  });
});

describe('money formatting', () => {
  const locales = ['en-US', 'en-GB', 'en-IN', 'de-DE', 'de-CH', 'fr-FR', 'fr-CH', 'es-ES', 'pl-PL', 'ja-JP', 'ar-EG', 'hi-IN', 'th-TH-u-nu-thai'];

  it('formats exactly as Intl formats the decimal string, in every currency and these locales (property)', () => {
    fc.assert(
      fc.property(
        fc.oneof(fc.integer({ min: -1_000_000, max: 1_000_000 }), fc.integer({ min: 0, max: Number.MAX_SAFE_INTEGER })),
        fc.constantFrom(...CURRENCY_CODES),
        fc.constantFrom(...locales),
        (amount, code, locale) => {
          const digits = currencyExponent(code);
          const intl = new Intl.NumberFormat(locale, { style: 'currency', currency: code, minimumFractionDigits: digits, maximumFractionDigits: digits });
          const decimal = minorToDecimal(amount, code);
          expect(moneyOf(amount, code, locale)).toEqual({ amountMinor: amount, currency: code, decimal, formatted: intl.format(decimal as unknown as number) });
        },
      ),
      { numRuns: 3000 },
    );
  });
});

describe('priced output', () => {
  it('is frozen below each line', () => {
    const q = priceQuote({
      spot: { gold: '2400.00', silver: '30.00' },
      lines: [
        { kind: 'weight', mark: '14K', grossWeight: { value: '10', unit: 'g' } },
        { kind: 'coin', coinType: 'us-90-dime', count: 10 },
        { kind: 'face-value', coinClass: 'us-90', faceValue: '1.00' },
        { kind: 'weight', mark: 'EPNS', grossWeight: { value: '10', unit: 'g' } },
      ],
    });
    for (const line of q.lines) {
      for (const value of Object.values(line)) if (typeof value === 'object' && value !== null) expect(Object.isFrozen(value)).toBe(true);
    }
  });
});
