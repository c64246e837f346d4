import { describe, expect, it } from 'vitest';
import { COIN_CATALOGUE, coinSpec, faceValueClass, GRAMS_PER_TROY_OUNCE } from '@/features/pricing';

const fineOzt = (grossGrams: string, fineness: string) => (Number(grossGrams) * Number(fineness)) / Number(GRAMS_PER_TROY_OUNCE);

describe('coin specifications', () => {
  // US Mint coin specifications (from memory): silver coinage to 1964 is 90% silver; dime 2.50 g, quarter 6.25 g,
  // half 12.50 g; silver dollar 1878-1935 26.73 g; 40% half 1965-1970 11.50 g; wartime five cents 5.00 g, 35% silver.
  it.each([
    ['us-90-dime', '2.50', '0.900', 0.07234],
    ['us-90-quarter', '6.25', '0.900', 0.18084],
    ['us-90-half', '12.50', '0.900', 0.36169],
    ['us-90-dollar', '26.73', '0.900', 0.7734],
    ['us-40-half', '11.50', '0.400', 0.1479],
    ['us-35-nickel', '5.00', '0.350', 0.05626],
  ])('US Mint (from memory): %s is %s g at %s, %s ozt fine', (type, gross, fineness, ozt) => {
    const c = coinSpec(type)!;
    expect(c.grossWeightGrams).toBe(gross);
    expect(c.fineness).toBe(fineness);
    expect(Number(c.fineTroyOunces)).toBe(ozt);
    // published figures are truncated to 4-5 places
    expect(fineOzt(gross, fineness)).toBeCloseTo(ozt, 3);
  });

  it('US Mint (from memory): 1 oz gold bullion coin 33.931 g, 22 karat, 1 ozt fine; 1 oz silver .999', () => {
    const gold = coinSpec('us-1oz-gold-bullion')!;
    expect([gold.grossWeightGrams, gold.fineness, gold.fineTroyOunces]).toEqual(['33.931', '0.9167', '1']);
    expect(fineOzt(gold.grossWeightGrams, gold.fineness)).toBeCloseTo(1, 3);
    expect(coinSpec('us-1oz-silver-bullion')!.fineness).toBe('0.999');
  });

  it('Royal Canadian Mint (from memory): 1 oz silver .9999 31.39 g; 1 oz gold .9999 31.11 g', () => {
    expect(coinSpec('ca-1oz-silver-bullion')).toMatchObject({ fineness: '0.9999', grossWeightGrams: '31.39', fineTroyOunces: '1' });
    expect(coinSpec('ca-1oz-gold-bullion')).toMatchObject({ fineness: '0.9999', grossWeightGrams: '31.11', fineTroyOunces: '1' });
  });

  it('The Royal Mint, South African Mint, Austrian Mint (from memory): 1 oz gold bullion coins', () => {
    expect(coinSpec('uk-1oz-gold-bullion-22k')).toMatchObject({ fineness: '0.9167', grossWeightGrams: '34.05' });
    expect(coinSpec('uk-1oz-gold-bullion-9999')).toMatchObject({ fineness: '0.9999', grossWeightGrams: '31.21' });
    expect(coinSpec('za-1oz-gold-bullion')).toMatchObject({ fineness: '0.9167', grossWeightGrams: '33.93' });
    expect(coinSpec('at-1oz-gold-bullion')).toMatchObject({ fineness: '0.9999', grossWeightGrams: '31.103' });
  });

  it('every catalogue coin holds at least its stated fine content, within 1% (gross x fineness)', () => {
    for (const c of COIN_CATALOGUE) {
      const computed = fineOzt(c.grossWeightGrams, c.fineness);
      expect(computed / Number(c.fineTroyOunces)).toBeGreaterThan(0.998);
      expect(computed / Number(c.fineTroyOunces)).toBeLessThan(1.01);
      expect(c.source.length).toBeGreaterThan(0);
    }
  });

  it('$1 face of 90% coin: 0.7234 ozt at mint weight (10 dimes x 2.50 g x 0.900), 0.715 ozt by common practice', () => {
    const cls = faceValueClass('us-90')!;
    expect(cls.troyOuncesPerDollarFace['mint-weight']).toBe('0.7234');
    expect(fineOzt('25.00', '0.900')).toBeCloseTo(0.7234, 4);
    expect(cls.troyOuncesPerDollarFace['common-practice']).toBe('0.715');
  });
});
