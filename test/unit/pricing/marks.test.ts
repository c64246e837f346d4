import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { isMarkKey, MARK_CATALOGUE, parseMark, parseMarkUncached } from '@/features/pricing';

type Row = [input: string, kind: string, key: string | undefined, fineness: string | undefined];

const READINGS: Row[] = [
  ['14K', 'solid', '14K', '0.583333'],
  ['14k', 'solid', '14K', '0.583333'],
  ['14 KT', 'solid', '14K', '0.583333'],
  ['14ct.', 'solid', '14K', '0.583333'],
  ['14-karat', 'solid', '14K', '0.583333'],
  ['K18', 'solid', '18K', '0.75'],
  ['10K', 'solid', '10K', '0.416667'],
  ['8k', 'solid', '8K', '0.333333'],
  ['24K', 'solid', '24K', '1'],
  ['14KP', 'solid', '14KP', '0.583333'],
  ['585', 'solid', '585', '0.585'],
  ['.585', 'solid', '585', '0.585'],
  ['417', 'solid', '417', '0.417'],
  ['375', 'solid', '375', '0.375'],
  ['750', 'solid', '750', '0.75'],
  ['916', 'solid', '916', '0.916'],
  // 990 is a fineness of gold, silver, platinum and palladium, and 800 of silver and (in some countries) gold:
  // read alone they need a test; with a metal symbol they read as that metal.
  ['990', 'needs-test', undefined, undefined],
  ['AU 990', 'solid', 'AU990', '0.99'],
  ['AG 990', 'solid', 'AG990', '0.99'],
  ['925', 'solid', '925', '0.925'],
  ['0.925', 'solid', '925', '0.925'],
  ['S925', 'solid', '925', '0.925'],
  ['800', 'needs-test', undefined, undefined],
  ['800 AG', 'solid', 'AG800', '0.8'],
  ['835', 'solid', '835', '0.835'],
  ['Sterling', 'solid', 'STERLING', '0.925'],
  ['gold vermeil 925', 'solid', '925', '0.925'],
  ['925 gold', 'needs-test', undefined, undefined],
  ['STER.', 'solid', 'STERLING', '0.925'],
  ['stg', 'solid', 'STERLING', '0.925'],
  ['sterling silver', 'solid', 'STERLING', '0.925'],
  ['Coin Silver', 'solid', 'COIN SILVER', '0.9'],
  ['COIN', 'solid', 'COIN SILVER', '0.9'],
  ['fine silver', 'solid', 'FINE SILVER', '0.999'],
  ['Fine Gold', 'solid', 'FINE GOLD', '0.999'],
  ['PT950', 'solid', 'PT950', '0.95'],
  ['950 Plat', 'solid', 'PT950', '0.95'],
  ['Platinum', 'solid', 'PLATINUM', '0.95'],
  ['PT 900', 'solid', 'PT900', '0.9'],
  ['850 PT', 'solid', '850', '0.85'],
  ['Pd950', 'solid', 'PD950', '0.95'],
  ['PALL 500', 'solid', 'PD500', '0.5'],
  ['Palladium', 'solid', 'PALLADIUM', '0.95'],
  ['18K 750', 'solid', '18K', '0.75'],
  ['1/20 14K GF', 'filled', '1/20 14K GF', '0.029167'],
  ['1/20 14kt G.F.', 'filled', '1/20 14K GF', '0.029167'],
  ['14K GF 1/20', 'filled', '1/20 14K GF', '0.029167'],
  ['1/10 12K RGP', 'filled', '1/10 12K RGP', '0.05'],
  ['1/10 10K gold filled', 'filled', '1/10 10K GF', '0.041667'],
  ['GF', 'needs-test', undefined, undefined],
  ['14K GF', 'needs-test', undefined, undefined],
  ['RGP', 'needs-test', undefined, undefined],
  ['GP', 'plated', undefined, undefined],
  ['18K GP', 'plated', undefined, undefined],
  ['18KGE', 'plated', undefined, undefined],
  ['HGE', 'plated', undefined, undefined],
  ['EP', 'plated', undefined, undefined],
  ['E.P.N.S.', 'plated', undefined, undefined],
  ['Silverplate', 'plated', undefined, undefined],
  ['silver plate', 'plated', undefined, undefined],
  ['Quadruple Plate', 'plated', undefined, undefined],
  ['sterling plated', 'plated', undefined, undefined],
  ['nickel silver', 'no-precious', undefined, undefined],
  ['German Silver', 'no-precious', undefined, undefined],
  ['950', 'needs-test', undefined, undefined],
  ['900', 'needs-test', undefined, undefined],
  ['500', 'needs-test', undefined, undefined],
  ['999', 'needs-test', undefined, undefined],
  ['14K 925', 'needs-test', undefined, undefined],
  ['silver', 'needs-test', undefined, undefined],
  ['7K', 'unknown', undefined, undefined],
  ['123', 'unknown', undefined, undefined],
  ['zzz', 'unknown', undefined, undefined],
  ['', 'unknown', undefined, undefined],
];

describe('purity marks', () => {
  it.each(READINGS)('reads %j as %s %s %s', (input, kind, key, fineness) => {
    const r = parseMark(input);
    expect(r.kind).toBe(kind);
    expect(r.key).toBe(key);
    expect(r.fineness).toBe(fineness);
  });

  it('keeps karat exact: 14K is 14/24, not 0.585', () => {
    const r = parseMark('14K');
    expect(r.finenessExact).toBe('14/24');
    expect(r.fineness).not.toBe('0.585');
  });

  it('gives the candidates of an ambiguous number and no metal', () => {
    const r = parseMark('950');
    expect(r.metal).toBeUndefined();
    expect(r.candidates.map((c) => c.key).sort()).toEqual(['AG950', 'PD950', 'PT950']);
    expect(parseMark('500').candidates.map((c) => c.metal).sort()).toEqual(['gold', 'palladium']);
    expect(parseMark('900').candidates.map((c) => c.metal).sort()).toEqual(['gold', 'platinum', 'silver']);
  });

  it('says why plated and nickel silver goods carry nothing to buy', () => {
    expect(parseMark('EPNS').notes.join(' ')).toMatch(/no buyable precious content/);
    expect(parseMark('EPNS').label).toMatch(/no buyable precious content/);
    expect(parseMark('nickel silver').notes.join(' ')).toMatch(/no silver/);
    expect(parseMark('GF').notes.join(' ')).toMatch(/fraction/);
  });

  it('describes the filled layer', () => {
    const r = parseMark('1/20 14K GF');
    expect(r.filled).toEqual({ layerFraction: '1/20', layerKarat: 14, layerFinenessExact: '14/24' });
    expect(r.finenessExact).toBe('14/480');
    expect(r.metal).toBe('gold');
  });

  it('every catalogue key reads back as itself', () => {
    for (const c of MARK_CATALOGUE) {
      expect(isMarkKey(c.key)).toBe(true);
    }
    expect(isMarkKey('1/20 14K GF')).toBe(true);
    expect(isMarkKey('14 karat')).toBe(false);
  });

  it('never throws and always returns a well-formed reading (property)', () => {
    const check = (s: string) => {
      const r = parseMarkUncached(s);
      expect(['solid', 'filled', 'plated', 'no-precious', 'needs-test', 'unknown']).toContain(r.kind);
      expect(typeof r.label).toBe('string');
      if (r.kind === 'solid' || r.kind === 'filled') {
        expect(r.metal).toBeDefined();
        expect(Number(r.fineness)).toBeGreaterThan(0);
        expect(Number(r.fineness)).toBeLessThanOrEqual(1);
      } else {
        expect(r.metal).toBeUndefined();
      }
      return true;
    };
    fc.assert(fc.property(fc.string({ maxLength: 60 }), check), { numRuns: 2000 });
    // fast-check 4 replaced fullUnicodeString with string({ unit }): 'binary' is any code point, lone surrogates included.
    fc.assert(fc.property(fc.string({ unit: 'binary', maxLength: 60 }), check), { numRuns: 2000 });
    fc.assert(fc.property(fc.string({ unit: 'grapheme', maxLength: 30 }), check), { numRuns: 1000 });
    const markish = fc.array(fc.constantFrom('14', 'K', 'KT', '1/20', 'GF', '925', 'PT', '950', 'STER', '.', ' ', '/', 'PLATE', '0', '999.9', 'EP', 'PD'), { maxLength: 8 }).map((a) => a.join(''));
    fc.assert(fc.property(markish, check), { numRuns: 2000 });
  });

  it('reads non-strings without throwing', () => {
    expect(parseMarkUncached(undefined).kind).toBe('unknown');
    expect(parseMarkUncached(925).key).toBe('925');
    expect(parseMarkUncached({}).kind).toBe('unknown');
    expect(parseMarkUncached('x'.repeat(100_000)).notes.join(' ')).toMatch(/first 200/);
  });

  it('the cache returns the same reading as a fresh parse', () => {
    for (const [input] of READINGS) expect(parseMark(input)).toEqual(parseMarkUncached(input));
  });
});
