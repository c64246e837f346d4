import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { AVOIRDUPOIS_REFUSAL, convertWeight, fromGrams, readWeightUnit, toGrams, WEIGHT_UNITS } from '@/features/pricing';

describe('weight units', () => {
  it('converts each unit to grams exactly', () => {
    expect(toGrams('1', 'ozt').toFixed()).toBe('31.1034768');
    expect(toGrams('1', 'dwt').toFixed()).toBe('1.55517384');
    expect(toGrams('1', 'gr').toFixed()).toBe('0.06479891');
    expect(toGrams('1.5', 'kg').toFixed()).toBe('1500');
    expect(toGrams('12.34', 'g').toFixed()).toBe('12.34');
  });

  it('keeps the troy relations exact: 20 dwt = 480 gr = 1 ozt', () => {
    expect(toGrams('20', 'dwt').eq(toGrams('1', 'ozt'))).toBe(true);
    expect(toGrams('480', 'gr').eq(toGrams('1', 'ozt'))).toBe(true);
    expect(convertWeight('24', 'gr', 'dwt').toFixed()).toBe('1');
    expect(convertWeight('1', 'kg', 'ozt').toFixed(6)).toBe('32.150747');
  });

  it('refuses avoirdupois ounces and pounds, saying why', () => {
    for (const unit of ['oz', 'OZ', 'ounce', 'avoirdupois', 'oz av', 'lb']) {
      const read = readWeightUnit(unit);
      expect(read.ok).toBe(false);
      if (!read.ok) {
        expect(read.message).toBe(AVOIRDUPOIS_REFUSAL);
        expect(read.message).toMatch(/troy/);
        expect(read.message).toMatch(/10% lighter/);
      }
    }
  });

  it('reads common spellings of the troy and metric units', () => {
    expect(readWeightUnit('Troy Ounce')).toEqual({ ok: true, unit: 'ozt' });
    expect(readWeightUnit('pwt')).toEqual({ ok: true, unit: 'dwt' });
    expect(readWeightUnit('grains')).toEqual({ ok: true, unit: 'gr' });
    expect(readWeightUnit(' G ')).toEqual({ ok: true, unit: 'g' });
    expect(readWeightUnit('stone').ok).toBe(false);
  });

  const decimalWeight = fc
    .tuple(fc.integer({ min: 0, max: 100_000 }), fc.integer({ min: 0, max: 999_999 }))
    .map(([i, f]) => `${i}.${String(f).padStart(6, '0')}`);

  it('round trips a weight entered in any unit through grams exactly (property)', () => {
    fc.assert(
      fc.property(decimalWeight, fc.constantFrom(...WEIGHT_UNITS), (value, unit) => fromGrams(toGrams(value, unit), unit).eq(value)),
      { numRuns: 1000 },
    );
  });

  it('converts between any two units and back to within 1e-60 relative (grams to troy units do not terminate) (property)', () => {
    fc.assert(
      fc.property(decimalWeight, fc.constantFrom(...WEIGHT_UNITS), fc.constantFrom(...WEIGHT_UNITS), (value, from, to) => {
        const back = convertWeight(convertWeight(value, from, to), to, from);
        return back.minus(value).abs().lte(toGrams(value, 'g').abs().mul('1e-60'));
      }),
      { numRuns: 500 },
    );
  });
});
