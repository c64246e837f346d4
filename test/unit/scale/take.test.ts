import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { weightSchema } from '@/features/pricing/pricing.schema';
import { toGrams, WEIGHT_UNITS, type WeightUnit } from '@/features/pricing/units';
import { parseScaleLine } from '@/features/scale/scale';
import { checkReading, convertExactly, placeWeight, READING_FRESH_MS, type ScaleWeight } from '@/features/scale/take';

const fresh = (line: string, ageMs = 100) => checkReading({ reading: parseScaleLine(line)!, ageMs });
const refusal = (line: string, ageMs = 100) => {
  const c = fresh(line, ageMs);
  if (c.ok) throw new Error(`expected ${line} to be refused`);
  return c.reason;
};
const taken = (line: string): ScaleWeight => {
  const c = fresh(line);
  if (!c.ok) throw new Error(c.reason);
  return c.weight;
};

describe('which readings may become a gross weight', () => {
  it('takes a settled positive reading as printed', () => {
    expect(taken('ST,GS,+  12.345 g')).toEqual({ shown: '12.345 g', value: '12.345', unit: 'g' });
    expect(taken('S S      4.20 dwt')).toEqual({ shown: '4.20 dwt', value: '4.20', unit: 'dwt' });
    expect(taken('+  0.3215 ozt')).toEqual({ shown: '0.3215 ozt', value: '0.3215', unit: 'ozt' });
  });

  it('refuses a reading still moving, in each layout, with the reason', () => {
    for (const line of ['US,GS,+  12.345 g', 'S D     12.345 g', '+   12.345 g ?']) {
      expect(refusal(line), line).toMatch(/not steady yet.*still moving.*settle/);
    }
  });

  it('refuses overload and underload with what to do', () => {
    expect(refusal('OL')).toMatch(/overloaded.*above its range/);
    expect(refusal('S +')).toMatch(/overloaded/);
    expect(refusal('OL,GS,-      OL')).toMatch(/below zero \(underload\).*zero the balance/);
  });

  it('refuses a negative and a zero reading', () => {
    expect(refusal('ST,GS,-   0.012 g')).toMatch(/negative weight \(-0.012 g\)/);
    expect(refusal('ST,GS,+   0.000 g')).toMatch(/reads zero/);
  });

  it('refuses avoirdupois ounces, counts, busy replies and unreadable lines, passing on the reason', () => {
    expect(refusal('ST,GS,+   0.500 oz')).toMatch(/no usable weight: .*avoirdupois/);
    expect(refusal('ST,QT,+      25 PCS')).toMatch(/counting pieces/);
    expect(refusal('S I')).toMatch(/busy/);
    expect(refusal('+  12,345 g')).toMatch(/cannot read what the scale sends \("\+  12,345 g"\): .*decimal comma.*baud rate/);
  });

  it('refuses when nothing came, or the last reading is older than the freshness window', () => {
    expect(checkReading(null)).toEqual({ ok: false, reason: expect.stringMatching(/No reading from the scale yet/) });
    expect(fresh('ST,GS,+  12.345 g', READING_FRESH_MS).ok).toBe(true);
    expect(refusal('ST,GS,+  12.345 g', READING_FRESH_MS + 1)).toMatch(/3 s old: the scale has stopped sending/);
  });

  it('writes carats and milligrams as grams, exactly (NIST Handbook 44, Appendix C: 1 metric carat = 200 mg)', () => {
    expect(taken('ST,GS,+   2.50 ct')).toEqual({ shown: '2.50 ct', value: '0.5', unit: 'g' });
    expect(taken('+  12.345 ct')).toMatchObject({ value: '2.469', unit: 'g' });
    expect(taken('+   1250 mg')).toMatchObject({ value: '1.25', unit: 'g' });
  });
});

describe('exact conversion between line units (NIST Handbook 44, Appendix C)', () => {
  it('multiplies exactly: 1 dwt = 1.55517384 g, 1 ozt = 31.1034768 g, 1 gr = 64.79891 mg', () => {
    expect(convertExactly('10', 'dwt', 'g')).toBe('15.5517384');
    expect(convertExactly('0.5', 'ozt', 'g')).toBe('15.5517384');
    expect(convertExactly('100', 'gr', 'g')).toBe('6.479891');
    expect(convertExactly('480', 'gr', 'ozt')).toBe('1');
    expect(convertExactly('20', 'dwt', 'ozt')).toBe('1');
    expect(convertExactly('1500', 'g', 'kg')).toBe('1.5');
  });

  it('returns null where the result does not terminate, or needs more than 10 places', () => {
    expect(convertExactly('12.345', 'g', 'dwt')).toBeNull();
    expect(convertExactly('1', 'g', 'ozt')).toBeNull();
    // 1.234 dwt = 1.91908451856 g: eleven places, more than a line's weight may have
    expect(convertExactly('1.234', 'dwt', 'g')).toBeNull();
  });

  it('is exact whenever it answers (property)', () => {
    const value = fc.tuple(fc.integer({ min: 1, max: 9_999_999 }), fc.integer({ min: 0, max: 4 })).map(([u, p]) => {
      const s = String(u).padStart(p + 1, '0');
      return p ? `${s.slice(0, -p)}.${s.slice(-p)}` : s;
    });
    const unit = fc.constantFrom<WeightUnit>(...WEIGHT_UNITS);
    fc.assert(
      fc.property(value, unit, unit, (v, from, to) => {
        const out = convertExactly(v, from, to);
        if (out === null) return;
        expect(toGrams(out, to).eq(toGrams(v, from))).toBe(true);
        expect(out.split('.')[1]?.length ?? 0).toBeLessThanOrEqual(10);
      }),
      { numRuns: 500 },
    );
  });
});

describe('placing a reading into a line', () => {
  const line = (grossUnit: WeightUnit, tareValue = '') => ({ grossUnit, tareValue });

  it('shows what the balance shows: the line takes the balance unit when it has no tare', () => {
    expect(placeWeight(taken('ST,GS,+  12.345 g'), line('g'))).toEqual({ ok: true, fields: { grossValue: '12.345', grossUnit: 'g', tareValue: '' }, shown: '12.345 g', note: null });
    expect(placeWeight(taken('ST,GS,+   7.90 dwt'), line('g'))).toEqual({
      ok: true,
      fields: { grossValue: '7.90', grossUnit: 'dwt', tareValue: '' },
      shown: '7.90 dwt',
      note: 'the line now weighs in pennyweights',
    });
    expect(placeWeight(taken('+  2.50 ct'), line('dwt'))).toMatchObject({ ok: true, fields: { grossValue: '0.5', grossUnit: 'g' }, shown: '2.50 ct (0.5 g)', note: 'the line now weighs in grams' });
  });

  it('rewrites a typed tare in the balance unit when that is exact', () => {
    expect(placeWeight(taken('ST,GS,+  20.000 g'), line('dwt', '1.5'))).toEqual({
      ok: true,
      fields: { grossValue: '20.000', grossUnit: 'g', tareValue: '2.33276076' },
      shown: '20.000 g',
      note: 'the tare of 1.5 dwt is now written as 2.33276076 g',
    });
  });

  it('otherwise writes the reading in the line unit when that is exact', () => {
    expect(placeWeight(taken('ST,GS,+   2.000 dwt'), line('g', '0.3'))).toEqual({
      ok: true,
      fields: { grossValue: '3.11034768', grossUnit: 'g', tareValue: '0.3' },
      shown: '2.000 dwt',
      note: 'written as 3.11034768 g, the unit of the tare',
    });
  });

  it('refuses, changing nothing, when neither can be written exactly in the other', () => {
    // 0.371 dwt = 0.57696949464 g (eleven places); 12.345 g in dwt does not terminate
    const placed = placeWeight(taken('ST,GS,+  12.345 g'), line('dwt', '0.371'));
    expect(placed).toEqual({ ok: false, reason: expect.stringMatching(/tare is in pennyweights and the scale weighs in grams; neither can be written exactly/) });
  });

  it('refuses while the typed tare is not a number', () => {
    expect(placeWeight(taken('ST,GS,+  12.345 g'), line('dwt', '0.3x'))).toMatchObject({ ok: false, reason: expect.stringMatching(/tare on this line is not a number/) });
  });

  it('gives weights the pricing schema accepts, with the same grams as the balance showed', () => {
    for (const [reading, into] of [
      ['ST,GS,+  12.345 g', line('g')],
      ['+  12.345 ct', line('dwt')],
      ['S S     3.5 ozt', line('g', '0.5')],
      ['ST,GS,+   2.000 dwt', line('g', '0.3')],
    ] as const) {
      const w = taken(reading);
      const placed = placeWeight(w, into);
      if (!placed.ok) throw new Error(placed.reason);
      const parsed = weightSchema.parse({ value: placed.fields.grossValue, unit: placed.fields.grossUnit });
      expect(toGrams(parsed.grams, 'g').eq(toGrams(w.value, w.unit)), reading).toBe(true);
    }
  });
});
