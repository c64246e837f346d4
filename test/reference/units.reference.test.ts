import { createRequire } from 'node:module';
import { describe, expect, it } from 'vitest';
import { GRAMS_PER_AVOIRDUPOIS_OUNCE, GRAMS_PER_GRAIN, GRAMS_PER_PENNYWEIGHT, GRAMS_PER_TROY_OUNCE, toGrams, type WeightUnit } from '@/features/pricing';

const require = createRequire(import.meta.url);
const ucum = require('@lhncbc/ucum-lhc') as { UcumLhcUtils: { getInstance(): { convertUnitTo(from: string, value: number, to: string): { status: string; toVal: number } } } };
const utils = ucum.UcumLhcUtils.getInstance();

describe('unit definitions', () => {
  // NIST Handbook 44, Appendix C (General Tables of Units of Measurement), from memory:
  // 1 grain = 64.798 91 milligrams exactly; 1 pennyweight = 24 grains; 1 troy ounce = 480 grains = 20 pennyweights.
  it('NIST Handbook 44 App. C: 1 grain = 64.79891 mg exactly', () => {
    expect(GRAMS_PER_GRAIN).toBe('0.06479891');
  });
  it('NIST Handbook 44 App. C: 1 pennyweight = 24 grains = 1.55517384 g', () => {
    expect(toGrams('24', 'gr').toFixed()).toBe(GRAMS_PER_PENNYWEIGHT);
    expect(GRAMS_PER_PENNYWEIGHT).toBe('1.55517384');
  });
  it('NIST Handbook 44 App. C: 1 troy ounce = 480 grains = 20 pennyweights = 31.1034768 g', () => {
    expect(toGrams('480', 'gr').toFixed()).toBe(GRAMS_PER_TROY_OUNCE);
    expect(toGrams('20', 'dwt').toFixed()).toBe(GRAMS_PER_TROY_OUNCE);
    expect(GRAMS_PER_TROY_OUNCE).toBe('31.1034768');
  });
  it('NIST Handbook 44 App. C: the avoirdupois ounce is 437.5 grains = 28.349523125 g, about 10% lighter than troy', () => {
    expect(toGrams('437.5', 'gr').toFixed()).toBe(GRAMS_PER_AVOIRDUPOIS_OUNCE);
    const ratio = Number(GRAMS_PER_AVOIRDUPOIS_OUNCE) / Number(GRAMS_PER_TROY_OUNCE);
    expect(ratio).toBeCloseTo(0.9115, 4);
  });
});

describe('cross-check against UCUM (@lhncbc/ucum-lhc, float arithmetic: 12 significant digits)', () => {
  const cases: [string, WeightUnit][] = [
    ['[oz_tr]', 'ozt'],
    ['[pwt_tr]', 'dwt'],
    ['[gr]', 'gr'],
    ['kg', 'kg'],
    ['g', 'g'],
  ];
  it.each(cases)('1 %s in grams matches Cupel %s', (ucumCode, unit) => {
    for (const value of [1, 7.25, 1000]) {
      const r = utils.convertUnitTo(ucumCode, value, 'g');
      expect(r.status).toBe('succeeded');
      const ours = toGrams(String(value), unit);
      expect(ours.minus(r.toVal).abs().div(ours).toNumber()).toBeLessThan(1e-12);
    }
  });
  it('UCUM [oz_av] is the avoirdupois ounce Cupel refuses', () => {
    expect(utils.convertUnitTo('[oz_av]', 1, 'g').toVal).toBeCloseTo(Number(GRAMS_PER_AVOIRDUPOIS_OUNCE), 9);
  });
});
