import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { MARK_CATALOGUE, parseMarkUncached, priceQuote, type Metal, type PricedLine, type UnpricedLine } from '@/features/pricing';

/**
 * The metals each millesimal number is a standard or customary fineness of, written out here
 * independently of the engine so the two can be compared.
 * - Hallmarking Convention / ISO 9202 standard finenesses (as listed in the trade brief): gold 375, 585,
 *   750, 916, 990, 999; silver 800, 925, 958, 999; platinum 850, 900, 950, 999; palladium 500, 950, 999.
 * - Customary marks (common practice, from memory): gold 333 (8K), 416/417 (10K), 500 (12K), 583 (14K),
 *   800 (19.2K) and 833 (20K) in some countries, 875 (21K), 900 (coin gold), 917 (22K), 958 (23K), 995,
 *   999.5 and 999.9; silver 830, 833, 835, 875, 900 (coin silver), 950, 970, 990 and 999.9; platinum and
 *   palladium 990, 995 and 999.5 (990 platinum and palladium are common Asian marks).
 */
const EXPECTED: Record<string, readonly Metal[]> = {
  '333': ['gold'],
  '375': ['gold'],
  '416': ['gold'],
  '417': ['gold'],
  '500': ['gold', 'palladium'],
  '583': ['gold'],
  '585': ['gold'],
  '750': ['gold'],
  '800': ['gold', 'silver'],
  '830': ['silver'],
  '833': ['gold', 'silver'],
  '835': ['silver'],
  '850': ['platinum'],
  '875': ['gold', 'silver'],
  '900': ['gold', 'platinum', 'silver'],
  '916': ['gold'],
  '917': ['gold'],
  '925': ['silver'],
  '950': ['palladium', 'platinum', 'silver'],
  '958': ['gold', 'silver'],
  '970': ['silver'],
  '990': ['gold', 'palladium', 'platinum', 'silver'],
  '995': ['gold', 'palladium', 'platinum'],
  '999': ['gold', 'palladium', 'platinum', 'silver'],
  '9995': ['gold', 'palladium', 'platinum'],
  '9999': ['gold', 'palladium', 'platinum', 'silver'],
};

const BRIEF_STANDARD: Record<Metal, string[]> = {
  gold: ['375', '585', '750', '916', '990', '999'],
  silver: ['800', '925', '958', '999'],
  platinum: ['850', '900', '950', '999'],
  palladium: ['500', '950', '999'],
};

/** Every word and symbol the counter reads as naming a metal. */
const METAL_WORDS: Record<Metal, string[]> = {
  gold: ['AU', 'G', 'GOLD', 'ORO'],
  silver: ['AG', 'S', 'SILVER', 'PLATA', 'ARGENTO', 'ARGENT'],
  platinum: ['PT', 'PLAT', 'PLATINUM', 'PLATINA'],
  palladium: ['PD', 'PALL', 'PALLADIUM'],
};
const ALL_METALS: Metal[] = ['gold', 'silver', 'platinum', 'palladium'];
const KARAT_FORMS = (k: number) => [`${k}K`, `${k} K`, `${k}KT`, `${k} kt`, `${k}CT`, `K${k}`, `K ${k}`, `${k} karat`, `${k}-carat`, `${k}KP`];
const NUMBERS = Object.keys(EXPECTED);
const KARATS = Array.from({ length: 17 }, (_, i) => i + 8);

/** How a number can be written: 925, .925, 0.925; 999.9, .9999. */
function numberForms(n: string): string[] {
  return n.length === 4 ? [n, `${n.slice(0, 3)}.${n.slice(3)}`, `.${n}`, `0.${n}`] : [n, `.${n}`, `0.${n}`];
}

const SPOT = { gold: '2400.00', silver: '30.00', platinum: '1000.00', palladium: '1000.00' };

function priceOne(mark: string, metal?: Metal) {
  const q = priceQuote({ spot: SPOT, lines: [{ kind: 'weight', mark, ...(metal ? { metal } : {}), grossWeight: { value: '10', unit: 'g' } }] });
  return q.lines[0]!;
}

// Noise: case per letter, spaces around and between tokens, dots after symbols, word before or after.
const caseNoise = (s: string) =>
  fc.array(fc.boolean(), { minLength: s.length, maxLength: s.length }).map((flags) => [...s].map((ch, i) => (flags[i] ? ch.toLowerCase() : ch.toUpperCase())).join(''));
const gap = fc.constantFrom('', ' ', '  ', '\t');
const dot = fc.constantFrom('', '.');

function withNoise(word: string, value: string) {
  return fc.tuple(caseNoise(word), caseNoise(value), dot, gap, gap, gap, fc.boolean()).map(([w, v, d, g1, g2, g3, before]) => {
    // Letters written against letters make one word ("14KAG"): keep a gap there; letters against digits split ("AG925").
    const between = g2 === '' && /[A-Za-z]\.?$/.test(before ? `${w}${d}` : v) && /^[A-Za-z]/.test(before ? v : w) ? ' ' : g2;
    return before ? `${g1}${w}${d}${between}${v}${g3}` : `${g1}${v}${between}${w}${d}${g3}`;
  });
}

const wordOf = (metal: Metal) => fc.constantFrom(...METAL_WORDS[metal]);

// Thousands of quotes per property: give them room on a loaded 2-core machine.
describe('mark corpus: a mark naming metal X is never priced as metal Y', { timeout: 60_000 }, () => {
  it('the engine lists exactly the metals of every number written out above', () => {
    const fromEngine: Record<string, Metal[]> = {};
    for (const c of MARK_CATALOGUE) {
      const m = /^(?:AU|AG|PT|PD)?(\d{3,4})$/.exec(c.key);
      if (m) (fromEngine[m[1]!] ??= []).push(c.metal);
    }
    for (const n of Object.keys(fromEngine)) fromEngine[n]!.sort();
    expect(fromEngine).toEqual(EXPECTED);
  });

  it('every standard fineness of the brief (Hallmarking Convention / ISO 9202) is listed for its metal', () => {
    for (const metal of ALL_METALS) for (const n of BRIEF_STANDARD[metal]) expect(EXPECTED[n]).toContain(metal);
  });

  it('every fineness x every metal word and symbol, each way round (exhaustive, no noise)', () => {
    for (const n of NUMBERS) {
      for (const named of ALL_METALS) {
        for (const word of METAL_WORDS[named]) {
          for (const form of numberForms(n)) {
            for (const mark of [`${word} ${form}`, `${form} ${word}`, `${word}${form}`]) {
              const fits = EXPECTED[n]!.includes(named);
              const reading = parseMarkUncached(mark);
              if (fits) {
                expect([mark, reading.kind, reading.metal, reading.finenessExact]).toEqual([mark, 'solid', named, `0.${n}`]);
              } else {
                expect([mark, reading.kind, reading.reason]).toEqual([mark, 'needs-test', 'metal-conflict']);
                expect(reading.candidates.map((c) => c.metal).sort()).toEqual([...EXPECTED[n]!]);
              }
            }
          }
        }
      }
    }
  });

  it('every karat form x every metal word: only gold words fit a karat', () => {
    for (const k of KARATS) {
      for (const form of KARAT_FORMS(k)) {
        for (const named of ALL_METALS) {
          for (const word of METAL_WORDS[named]) {
            const reading = parseMarkUncached(`${form} ${word}`);
            if (named === 'gold') expect([form, word, reading.kind, reading.metal]).toEqual([form, word, 'solid', 'gold']);
            else expect([form, word, reading.kind, reading.reason]).toEqual([form, word, 'needs-test', 'metal-conflict']);
          }
        }
      }
    }
  });

  it('priced only as the metal the mark names, whatever metal the line states (property, with noise)', () => {
    const numberMark = fc
      .tuple(fc.constantFrom(...NUMBERS), fc.constantFrom(...ALL_METALS))
      .chain(([n, named]) => fc.tuple(fc.constant(n), fc.constant(named), fc.constantFrom(...numberForms(n)).chain((form) => wordOf(named).chain((w) => withNoise(w, form)))));
    const lineMetal = fc.option(fc.constantFrom(...ALL_METALS), { nil: undefined });
    fc.assert(
      fc.property(numberMark, lineMetal, ([n, named, mark], metal) => {
        const line = priceOne(mark, metal);
        const fits = EXPECTED[n]!.includes(named);
        if (line.status === 'priced') {
          expect((line as PricedLine).metal).toBe(named);
          expect(fits).toBe(true);
          expect(metal === undefined || metal === named).toBe(true);
          expect((line as PricedLine).markedFinenessExact).toBe(`0.${n}`);
        } else {
          expect(line.status).toBe('needs-test');
          // Held back only when the number does not fit the word, or the line names another metal.
          expect(!fits || (metal !== undefined && metal !== named)).toBe(true);
          if (!fits) expect((line as UnpricedLine).mark.candidates.map((c) => c.metal).sort()).toEqual([...EXPECTED[n]!]);
        }
      }),
      { numRuns: 3000 },
    );
  });

  it('a karat with a metal word is priced only as gold, and only with a gold word (property, with noise)', () => {
    const karatMark = fc
      .tuple(fc.constantFrom(...KARATS), fc.constantFrom(...ALL_METALS))
      .chain(([k, named]) => fc.tuple(fc.constant(k), fc.constant(named), fc.constantFrom(...KARAT_FORMS(k)).chain((form) => wordOf(named).chain((w) => withNoise(w, form)))));
    const lineMetal = fc.option(fc.constantFrom(...ALL_METALS), { nil: undefined });
    fc.assert(
      fc.property(karatMark, lineMetal, ([k, named, mark], metal) => {
        const line = priceOne(mark, metal);
        if (line.status === 'priced') {
          expect([mark, named, (line as PricedLine).metal]).toEqual([mark, 'gold', 'gold']);
          expect((line as PricedLine).markedFinenessExact).toBe(`${k}/24`);
          expect(metal === undefined || metal === 'gold').toBe(true);
        } else {
          expect(line.status).toBe('needs-test');
          expect(named !== 'gold' || (metal !== undefined && metal !== 'gold')).toBe(true);
        }
      }),
      { numRuns: 2000 },
    );
  });

  it('a number alone comes back with all its metals, and the line can pick only one of them (property, with noise)', () => {
    const bare = fc.constantFrom(...NUMBERS).chain((n) =>
      fc.tuple(fc.constant(n), fc.constantFrom(...numberForms(n)), gap, gap).map(([num, form, a, b]) => [num, `${a}${form}${b}`] as const),
    );
    const lineMetal = fc.option(fc.constantFrom(...ALL_METALS), { nil: undefined });
    fc.assert(
      fc.property(bare, lineMetal, ([n, mark], metal) => {
        const expected = EXPECTED[n]!;
        const reading = parseMarkUncached(mark);
        if (expected.length > 1) {
          expect(reading.kind).toBe('needs-test');
          expect(reading.reason).toBe('ambiguous-metal');
          expect(reading.candidates.map((c) => c.metal).sort()).toEqual([...expected]);
        } else {
          expect([reading.kind, reading.metal]).toEqual(['solid', expected[0]]);
        }
        const line = priceOne(mark, metal);
        const pickable = metal === undefined ? expected.length === 1 : expected.includes(metal);
        expect(line.status).toBe(pickable ? 'priced' : 'needs-test');
        if (line.status === 'priced') expect((line as PricedLine).metal).toBe(metal ?? expected[0]);
      }),
      { numRuns: 1500 },
    );
  });

  it('two marks of different metals are never priced, whatever the line states (property)', () => {
    const markOf = (metal: Metal) =>
      metal === 'gold'
        ? fc.oneof(fc.constantFrom(...KARATS).map((k) => `${k}K`), fc.constantFrom('585', '750', '375', '916'))
        : metal === 'silver'
          ? fc.constantFrom('925', 'STERLING', 'STER', 'COIN SILVER', 'BRITANNIA', 'AG 800')
          : metal === 'platinum'
            ? fc.constantFrom('PT950', 'PT900', '850', 'PLATINUM')
            : fc.constantFrom('PD950', 'PD 500', 'PALLADIUM');
    const pair = fc
      .tuple(fc.constantFrom(...ALL_METALS), fc.constantFrom(...ALL_METALS))
      .filter(([a, b]) => a !== b)
      .chain(([a, b]) => fc.tuple(markOf(a), markOf(b), gap.map((g) => g || ' ')));
    fc.assert(
      fc.property(pair, fc.option(fc.constantFrom(...ALL_METALS), { nil: undefined }), ([a, b, g], metal) => {
        expect(priceOne(`${a}${g}${b}`, metal).status).toBe('needs-test');
      }),
      { numRuns: 1000 },
    );
  });
});
