import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { parseScaleLine, readScaleUnit, type ScaleReading } from '@/features/scale/scale';

const weight = (line: string) => {
  const r = parseScaleLine(line);
  if (r?.kind !== 'weight') throw new Error(`expected a weight from ${JSON.stringify(line)}, got ${JSON.stringify(r)}`);
  return r;
};
const kindOf = (line: string) => parseScaleLine(line)?.kind;
const reasonOf = (line: string) => {
  const r = parseScaleLine(line);
  return r && 'reason' in r ? r.reason : null;
};

describe('the coded layout: stability code, data code, sign, value, unit', () => {
  it('reads a settled gross reading', () => {
    expect(weight('ST,GS,+  12.345 g')).toMatchObject({ layout: 'coded', stable: true, negative: false, value: '12.345', unit: 'g', basis: 'gross' });
  });

  it('reads US as a reading still moving, and NT as net of the balance tare', () => {
    expect(weight('US,GS,+  12.345 g')).toMatchObject({ stable: false, value: '12.345' });
    expect(weight('ST,NT,+   3.210 dwt')).toMatchObject({ stable: true, basis: 'net', unit: 'dwt', value: '3.210' });
  });

  it('keeps the printed resolution, drops leading zeros and reads the sign', () => {
    expect(weight('ST,GS,+0012.340 g').value).toBe('12.340');
    expect(weight('ST,GS,-   0.012 g')).toMatchObject({ negative: true, value: '0.012' });
    expect(weight('ST,GS,   .500 g').value).toBe('0.500');
  });

  it('accepts lower case, no data code, and framing bytes around the line', () => {
    expect(weight('st,gs,+ 1.5 ozt')).toMatchObject({ stable: true, unit: 'ozt', value: '1.5' });
    expect(weight('ST,+   8.00 g')).toMatchObject({ basis: null, value: '8.00' });
    expect(weight('\x02ST,GS,+  2.000 ct\x03')).toMatchObject({ unit: 'ct', value: '2.000' });
  });

  it('reads OL as out of range: overload, or underload when the sign is minus', () => {
    expect(kindOf('OL,GS,+      OL')).toBe('overload');
    expect(kindOf('OL,GS,-      OL')).toBe('underload');
    expect(kindOf('OL,GS')).toBe('overload');
    expect(kindOf('ST,GS,+   OL')).toBe('overload');
  });

  it('refuses a tare memory record and a piece count as not a weight', () => {
    expect(parseScaleLine('ST,TR,+  10.000 g')).toMatchObject({ kind: 'no-weight', reason: expect.stringMatching(/tare memory/) });
    expect(parseScaleLine('ST,QT,+      25 PCS')).toMatchObject({ kind: 'no-weight', reason: expect.stringMatching(/counting pieces/) });
  });

  it('calls an unknown data code unreadable instead of guessing', () => {
    expect(parseScaleLine('ST,ZZ,+  12.345 g')).toMatchObject({ kind: 'unreadable', reason: 'unknown data code "ZZ"' });
  });
});

describe('the reply layout: S, a status letter, value, unit', () => {
  it('reads S S as settled and S D as still moving', () => {
    expect(weight('S S     12.345 g')).toMatchObject({ layout: 'reply', stable: true, value: '12.345', unit: 'g' });
    expect(weight('S D     12.347 g')).toMatchObject({ layout: 'reply', stable: false, value: '12.347' });
    expect(weight('S S    -0.004 g')).toMatchObject({ negative: true, value: '0.004' });
  });

  it('reads S + and S - as over and under range, S I as busy, and ES/ET/EL as a refused command', () => {
    expect(kindOf('S +')).toBe('overload');
    expect(kindOf('S -')).toBe('underload');
    expect(parseScaleLine('S I')).toMatchObject({ kind: 'no-weight', reason: expect.stringMatching(/busy/) });
    for (const l of ['ES', 'ET', 'EL']) expect(parseScaleLine(l)).toMatchObject({ kind: 'no-weight', layout: 'reply' });
  });
});

describe('the plain layout: sign, value, unit, with a ? while moving', () => {
  it('reads a plain reading as settled', () => {
    expect(weight('+   12.34 g')).toMatchObject({ layout: 'plain', stable: true, value: '12.34', unit: 'g', basis: null });
    expect(weight('12.34g')).toMatchObject({ value: '12.34', unit: 'g' });
  });

  it('reads a ? anywhere, or the word MOTION or US, as a reading still moving', () => {
    for (const l of ['+   12.34 g ?', '?+  12.34 g', '+ 12.34 ? g', '12.34 g MOTION', 'US 12.34 g', '12.34 g US']) {
      expect(weight(l), l).toMatchObject({ stable: false, value: '12.34', unit: 'g' });
    }
  });

  it('reads a gross or net label before the number or after the unit', () => {
    expect(weight('N  12.345 dwt')).toMatchObject({ basis: 'net', unit: 'dwt' });
    expect(weight('G 1.5 ozt')).toMatchObject({ basis: 'gross', unit: 'ozt' });
    expect(weight('NET: 3.2 g')).toMatchObject({ basis: 'net', value: '3.2' });
    expect(weight('12.345 g N')).toMatchObject({ basis: 'net', unit: 'g' });
    expect(weight('12.345 g ST')).toMatchObject({ stable: true });
  });

  it('keeps an upper-case G after the number as grams, not a gross label', () => {
    expect(weight('+  12.345 G')).toMatchObject({ unit: 'g', basis: null, value: '12.345' });
  });

  it('reads overload and underload words and patterns', () => {
    for (const l of ['OL', '+  OL', 'O-L', 'OVER', 'OVERLOAD', 'HHHHHH', '-- OL --']) expect(kindOf(l), l).toBe('overload');
    for (const l of ['-  OL', 'UL', 'UNDER', 'LLLLLL']) expect(kindOf(l), l).toBe('underload');
  });

  it('reports an error shown by the balance', () => {
    expect(parseScaleLine('Err 4')).toMatchObject({ kind: 'no-weight', reason: expect.stringMatching(/error \(4\)/) });
  });
});

describe('units a balance prints', () => {
  it('reads g, mg, kg, ct, dwt, ozt and gr in their usual spellings', () => {
    const cases: [string, string][] = [
      ['g', 'g'], ['G', 'g'], ['mg', 'mg'], ['kg', 'kg'], ['ct', 'ct'], ['CT', 'ct'], ['carat', 'ct'],
      ['dwt', 'dwt'], ['DWT', 'dwt'], ['pwt', 'dwt'], ['ozt', 'ozt'], ['oz t', 'ozt'], ['toz', 'ozt'], ['t oz', 'ozt'],
      ['gr', 'gr'], ['GN', 'gr'], ['grain', 'gr'],
    ];
    for (const [text, unit] of cases) expect(readScaleUnit(text), text).toEqual({ ok: true, unit });
  });

  it('refuses avoirdupois ounces and pounds as never used for precious metal, giving both ounces in grams', () => {
    for (const line of ['ST,GS,+   0.500 oz', '+ 1.25 OZ', 'S S   0.02 lb']) {
      const r = parseScaleLine(line) as Extract<ScaleReading, { kind: 'no-weight' }>;
      expect(r.kind, line).toBe('no-weight');
      // NIST Handbook 44, Appendix C: 1 oz avdp = 28.349523125 g; 1 oz t = 31.1034768 g.
      expect(r.reason).toMatch(/avoirdupois unit never used for precious metal/);
      expect(r.reason).toContain('28.349523125 g');
      expect(r.reason).toContain('31.1034768 g');
    }
  });

  it('refuses a count or a percentage, and calls an unknown unit unreadable', () => {
    expect(parseScaleLine('+   12 pcs')).toMatchObject({ kind: 'no-weight' });
    expect(parseScaleLine('+ 98.5 %')).toMatchObject({ kind: 'no-weight' });
    expect(parseScaleLine('+ 12.3 tl')).toMatchObject({ kind: 'unreadable', reason: 'unknown unit "tl"' });
  });
});

describe('lines that are not readings', () => {
  it('ignores blank lines', () => {
    expect(parseScaleLine('')).toBeNull();
    expect(parseScaleLine('   \t ')).toBeNull();
    expect(parseScaleLine('\x02\x03')).toBeNull();
  });

  it('refuses a number without a unit rather than guessing one', () => {
    expect(reasonOf('+   12.345')).toBe('the balance sent a number without a unit');
  });

  it('refuses a decimal comma rather than risk reading 1,234 as a thousand', () => {
    expect(reasonOf('+  1,234 g')).toMatch(/decimal comma/);
  });

  it('calls noise and over-long lines unreadable', () => {
    expect(kindOf('\xff\xfe#%&')).toBe('unreadable');
    expect(kindOf('Date 2026-03-01  Balance ID 4471')).toBe('unreadable');
    expect(parseScaleLine('9'.repeat(200))).toMatchObject({ kind: 'unreadable', reason: expect.stringMatching(/longer/) });
  });
});

describe('any reading written in any layout is read back as written (property)', () => {
  const value = fc.tuple(fc.integer({ min: 0, max: 99_999 }), fc.integer({ min: 0, max: 4 })).map(([units, places]) => {
    const s = String(units).padStart(places + 1, '0');
    return places === 0 ? s : `${s.slice(0, -places)}.${s.slice(-places)}`;
  });
  const unit = fc.constantFrom(['g', 'g'], ['ct', 'ct'], ['dwt', 'dwt'], ['ozt', 'ozt'], ['gr', 'gr'], ['GN', 'gr'], ['mg', 'mg'], ['kg', 'kg']);
  const pad = fc.integer({ min: 0, max: 6 }).map((n) => ' '.repeat(n));

  it('keeps stability, sign, value and unit', () => {
    fc.assert(
      fc.property(value, unit, fc.boolean(), fc.boolean(), fc.constantFrom('coded', 'reply', 'plain'), pad, pad, (v, [printed, read], stable, negative, layout, p1, p2) => {
        const sign = negative ? '-' : '+';
        const line =
          layout === 'coded'
            ? `${stable ? 'ST' : 'US'},GS,${sign}${p1}${v}${p2} ${printed}`
            : layout === 'reply'
              ? `S ${stable ? 'S' : 'D'} ${p1}${negative ? '-' : ''}${v} ${printed}`
              : `${sign}${p1}${v}${p2} ${printed}${stable ? '' : ' ?'}`;
        const r = parseScaleLine(`${line}\r`);
        expect(r).toMatchObject({ kind: 'weight', layout, stable, negative, unit: read });
        const expected = v.replace(/^0+(?=\d)/, '');
        expect((r as { value: string }).value).toBe(expected);
      }),
      { numRuns: 500 },
    );
  });
});
