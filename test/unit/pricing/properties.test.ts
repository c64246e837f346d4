import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { priceQuote, priceQuoteUnchecked, QuoteValidationError, safePriceQuote, type PricedLine } from '@/features/pricing';
import { mixedTicket, quote } from './factories';

/** Decimal strings built from integers: no float ever produced. */
const decimal = (maxUnits: number, places: number) =>
  fc.integer({ min: 1, max: maxUnits }).map((u) => {
    const s = String(u).padStart(places + 1, '0');
    return places === 0 ? s : `${s.slice(0, -places)}.${s.slice(-places)}`;
  });
const weight = decimal(10_000_000, 2); // 0.01 g .. 100 kg
const fineness = decimal(1000, 3); // 0.001 .. 1.000
const spot = decimal(10_000_000, 2); // 0.01 .. 100000.00
const percent = decimal(10_000, 2); // 0.01 .. 100.00
const metal = fc.constantFrom('gold', 'silver', 'platinum', 'palladium' as const);

function price(w: string, f: string, s: string, p: string, m: 'gold' | 'silver' | 'platinum' | 'palladium') {
  const q = priceQuote(
    quote(
      [{ kind: 'weight', category: 'scrap', metal: m, fineness: f, grossWeight: { value: w, unit: 'g' }, rateOverride: { basis: 'percent-of-melt', percent: p } }],
      { spot: { [m]: s } },
    ),
  );
  return q.lines[0] as PricedLine;
}

const cmp = (a: string, b: string) => {
  const [ai = '', af = ''] = a.split('.');
  const [bi = '', bf = ''] = b.split('.');
  const width = Math.max(af.length, bf.length);
  return BigInt(ai + af.padEnd(width, '0')) - BigInt(bi + bf.padEnd(width, '0'));
};

describe('pricing properties', () => {
  it('melt and payout never fall when weight, fineness or spot rise', () => {
    fc.assert(
      fc.property(weight, weight, fineness, fineness, spot, spot, percent, metal, (w1, w2, f1, f2, s1, s2, p, m) => {
        const [wl, wh] = cmp(w1, w2) <= 0n ? [w1, w2] : [w2, w1];
        const [fl, fh] = cmp(f1, f2) <= 0n ? [f1, f2] : [f2, f1];
        const [sl, sh] = cmp(s1, s2) <= 0n ? [s1, s2] : [s2, s1];
        const low = price(wl, fl, sl, p, m);
        for (const high of [price(wh, fl, sl, p, m), price(wl, fh, sl, p, m), price(wl, fl, sh, p, m)]) {
          expect(high.meltValue.amountMinor).toBeGreaterThanOrEqual(low.meltValue.amountMinor);
          expect(high.payout.amountMinor).toBeGreaterThanOrEqual(low.payout.amountMinor);
        }
      }),
      { numRuns: 200 },
    );
  });

  it('payout never exceeds melt and is never negative when the rate is at most 100%', () => {
    fc.assert(
      fc.property(weight, fineness, spot, percent, metal, (w, f, s, p, m) => {
        const line = price(w, f, s, p, m);
        expect(line.payout.amountMinor).toBeGreaterThanOrEqual(0);
        expect(line.payout.amountMinor).toBeLessThanOrEqual(line.meltValue.amountMinor);
        expect(line.margin.amountMinor).toBe(line.meltValue.amountMinor - line.payout.amountMinor);
        expect(Number.isSafeInteger(line.meltValue.amountMinor)).toBe(true);
      }),
      { numRuns: 300 },
    );
  });

  it('totals are exactly the sums of the rounded lines', () => {
    const lineArb = fc.record({ w: weight, f: fineness, m: metal, p: percent });
    fc.assert(
      fc.property(fc.array(lineArb, { minLength: 1, maxLength: 25 }), spot, (rows, s) => {
        const q = priceQuote(
          quote(
            rows.map((r) => ({ kind: 'weight' as const, category: 'scrap' as const, metal: r.m, fineness: r.f, grossWeight: { value: r.w, unit: 'g' as const }, rateOverride: { basis: 'percent-of-melt' as const, percent: r.p } })),
            { spot: { gold: s, silver: s, platinum: s, palladium: s } },
          ),
        );
        const lines = q.lines as PricedLine[];
        const sum = (f: (l: PricedLine) => number) => lines.reduce((a, l) => a + f(l), 0);
        expect(q.totals.meltValue.amountMinor).toBe(sum((l) => l.meltValue.amountMinor));
        expect(q.totals.payout.amountMinor).toBe(sum((l) => l.payout.amountMinor));
        expect(q.totals.margin.amountMinor).toBe(sum((l) => l.margin.amountMinor));
        const perMetal = q.totals.byMetal.reduce((a, m) => a + m.meltValue.amountMinor, 0);
        expect(perMetal).toBe(q.totals.meltValue.amountMinor);
      }),
      { numRuns: 100 },
    );
  });

  it('priced twice (cached) gives the same quote as priced once', () => {
    const v = mixedTicket(60);
    const first = priceQuote(v);
    expect(priceQuote(v)).toEqual(first);
    expect(JSON.stringify(priceQuote(v))).toBe(JSON.stringify(first));
  });

  it('on any JSON input, either prices or reports issues, and throws nothing else', () => {
    const json = fc.jsonValue({ maxDepth: 4 });
    const lineish = fc.record(
      {
        kind: fc.constantFrom('weight', 'coin', 'face-value', 'fine-weight', 'other'),
        mark: fc.string({ maxLength: 12 }),
        grossWeight: fc.record({ value: fc.oneof(fc.string({ maxLength: 8 }), fc.double(), fc.constant('5')), unit: fc.constantFrom('g', 'oz', 'dwt', 'x') }),
        coinType: fc.constantFrom('us-90-dime', 'nope'),
        count: fc.oneof(fc.integer(), fc.double()),
        fineness: fc.oneof(fc.string({ maxLength: 6 }), fc.constant('0.5')),
        metal: fc.constantFrom('gold', 'silver', 'lead'),
      },
      { requiredKeys: ['kind'] },
    );
    fc.assert(
      fc.property(fc.oneof(json, fc.record({ spot: fc.record({ gold: fc.constantFrom('2400', '0', 'x') }), lines: fc.array(lineish, { maxLength: 4 }) })), (input) => {
        const r = safePriceQuote(input);
        if (!r.ok) expect(r.issues.length).toBeGreaterThan(0);
        try {
          priceQuote(input);
        } catch (e) {
          expect(e).toBeInstanceOf(QuoteValidationError);
        }
      }),
      { numRuns: 500 },
    );
  });

  it('priceQuoteUnchecked and priceQuote agree on validated input', () => {
    const r = safePriceQuote(mixedTicket(30));
    expect(r.ok).toBe(true);
    if (r.ok) expect(r.quote.totals.meltValue.amountMinor).toBeGreaterThan(0);
    expect(typeof priceQuoteUnchecked).toBe('function');
  });
});
