import { describe, expect, it } from 'vitest';
import { priceQuote, QuoteValidationError, safePriceQuote, type PricedLine, type PricedQuote } from '@/features/pricing';
import { quote, SPOT, weightLine } from './factories';

function priced(q: PricedQuote, i = 0): PricedLine {
  const line = q.lines[i]!;
  if (line.status !== 'priced') throw new Error(`line ${i} is ${line.status}`);
  return line;
}

function issuesOf(input: unknown): { path: string; message: string }[] {
  const r = safePriceQuote(input);
  if (r.ok) throw new Error('expected validation issues');
  return r.issues;
}

describe('weight lines', () => {
  it('prices 10.5 g of 14K at 2400/ozt with every figure stated', () => {
    const line = priced(priceQuote(quote([weightLine({ grossWeight: { value: '10.5', unit: 'g' } })])));
    // fine = 10.5 x 14/24 = 6.125 g = 0.196925... ozt; melt = 6.125 / 31.1034768 x 2400 = 472.6157...
    expect(line.metal).toBe('gold');
    expect(line.markedFineness).toBe('0.583333');
    expect(line.markedFinenessExact).toBe('14/24');
    expect(line.paidOnFineness).toBe('0.583333');
    expect(line.finenessSource).toBe('mark');
    expect(line.netWeightGrams).toBe('10.5000');
    expect(line.fineWeightGrams).toBe('6.1250');
    expect(line.fineWeightTroyOunces).toBe('0.196923');
    expect(line.meltValue.amountMinor).toBe(47262);
    expect(line.meltValue.formatted).toBe('$472.62');
    expect(line.payoutRate).toMatchObject({ basis: 'percent-of-melt', percent: '80', rateCategory: 'gold-jewelry-14k-to-17k', source: 'default' });
    // payout = 472.6157... x 0.80 = 378.0926 -> 378.09
    expect(line.payout.amountMinor).toBe(37809);
    expect(line.margin.amountMinor).toBe(47262 - 37809);
    expect(line.marginPercentOfMelt).toBe('20.00');
  });

  it('pays on the assumed fineness of the store setting and shows both finenesses', () => {
    const line = priced(priceQuote(quote([weightLine({ grossWeight: { value: '10', unit: 'g' } })], { assumedFineness: { '14K': '0.575' } })));
    expect(line.markedFineness).toBe('0.583333');
    expect(line.paidOnFineness).toBe('0.575');
    expect(line.finenessSource).toBe('assumed');
    expect(line.fineWeightGrams).toBe('5.7500');
  });

  it('subtracts tare and deductions in grams and percent: net = gross - tare - deductions', () => {
    const line = priced(
      priceQuote(
        quote([
          weightLine({
            mark: 'Sterling',
            category: 'hollowware',
            grossWeight: { value: '500', unit: 'g' },
            tare: { value: '20', unit: 'g' },
            deductions: [
              { kind: 'percent', value: '25', reason: 'weighted base (cement)' },
              { kind: 'grams', value: '30', reason: 'steel insert' },
            ],
          }),
        ]),
      ),
    );
    // 500 - 20 = 480; 25% of 480 = 120; net = 480 - 120 - 30 = 330
    expect(line.tareGrams).toBe('20.0000');
    expect(line.deductionsGrams).toBe('150.0000');
    expect(line.netWeightGrams).toBe('330.0000');
    expect(line.fineWeightGrams).toBe('305.2500');
    expect(line.payoutRate.rateCategory).toBe('silver-flatware');
  });

  it('accepts gross weight in dwt and ozt exactly', () => {
    const dwt = priced(priceQuote(quote([weightLine({ mark: '24K', grossWeight: { value: '20', unit: 'dwt' } })])));
    expect(dwt.fineWeightTroyOunces).toBe('1.000000');
    expect(dwt.meltValue.amountMinor).toBe(240000);
  });

  it('uses a tested fineness over the mark', () => {
    const line = priced(priceQuote(quote([weightLine({ mark: '14K', fineness: '0.5', grossWeight: { value: '31.1034768', unit: 'g' } })])));
    expect(line.finenessSource).toBe('test');
    expect(line.paidOnFineness).toBe('0.5');
    expect(line.meltValue.amountMinor).toBe(120000);
  });

  it('prices gold-filled on its gold share and under its own rate', () => {
    const line = priced(priceQuote(quote([weightLine({ mark: '1/20 14K GF', grossWeight: { value: '48', unit: 'g' } })])));
    // 48 g x 1/20 x 14/24 = 1.4 g fine
    expect(line.fineWeightGrams).toBe('1.4000');
    expect(line.payoutRate.rateCategory).toBe('gold-filled');
  });

  it('bands gold jewelry by karat', () => {
    const cat = (mark: string) => priced(priceQuote(quote([weightLine({ mark })]))).payoutRate.rateCategory;
    expect(cat('10K')).toBe('gold-jewelry-below-14k');
    expect(cat('583')).toBe('gold-jewelry-14k-to-17k');
    expect(cat('585')).toBe('gold-jewelry-14k-to-17k');
    expect(cat('750')).toBe('gold-jewelry-18k-to-21k');
    // 22K and 24K have bands of their own (they shared the 18K-and-above band).
    expect(cat('22K')).toBe('gold-jewelry-22k-to-23k');
    expect(cat('24K')).toBe('gold-jewelry-24k');
  });

  it('leaves an ambiguous mark unpriced with its candidates, and prices it once the metal is stated', () => {
    const q = priceQuote(quote([weightLine({ mark: '950' }), weightLine({ mark: '950', metal: 'platinum' })]));
    const first = q.lines[0]!;
    expect(first.status).toBe('needs-test');
    if (first.status !== 'priced') expect(first.mark.candidates.map((c) => c.key)).toContain('PD950');
    expect(priced(q, 1).metal).toBe('platinum');
    expect(priced(q, 1).paidOnFineness).toBe('0.95');
    expect(q.totals.pricedLineCount).toBe(1);
    expect(q.totals.unpricedLineCount).toBe(1);
  });

  it('marks plated goods not buyable, at zero in the totals', () => {
    const q = priceQuote(quote([weightLine({ mark: 'EPNS' }), weightLine({ mark: '925' })]));
    expect(q.lines[0]!.status).toBe('not-buyable');
    expect(q.totals.meltValue.amountMinor).toBe(priced(q, 1).meltValue.amountMinor);
  });
});

describe('coins, face value and fine weight', () => {
  it('prices coins by count from the catalogue', () => {
    const line = priced(priceQuote(quote([{ kind: 'coin', coinType: 'us-90-dollar', count: 10 }])));
    expect(line.coin).toEqual({ coinType: 'us-90-dollar', count: 10, label: 'US silver dollar, 90% silver (1878-1935)' });
    expect(line.grossWeightGrams).toBe('267.3000');
    expect(line.fineWeightTroyOunces).toBe('7.734000');
    expect(line.meltValue.amountMinor).toBe(23202); // 7.734 x 30.00
    expect(line.payoutRate.rateCategory).toBe('silver-coin');
  });

  it('counts 90% face value at 0.715 ozt per $1 (common practice) or 0.7234 (mint weight)', () => {
    const q = priceQuote(
      quote([
        { kind: 'face-value', coinClass: 'us-90', faceValue: '10.00', basis: 'common-practice' },
        { kind: 'face-value', coinClass: 'us-90', faceValue: '10.00', basis: 'mint-weight' },
      ]),
    );
    expect(priced(q, 0).fineWeightTroyOunces).toBe('7.150000');
    expect(priced(q, 0).meltValue.amountMinor).toBe(21450);
    expect(priced(q, 1).fineWeightTroyOunces).toBe('7.234000');
  });

  it('prices bullion at an amount under spot', () => {
    const q = priceQuote(
      quote([{ kind: 'coin', coinType: 'us-1oz-gold-bullion', count: 2 }], {
        rates: { 'gold-bullion': { basis: 'under-spot', amountPerTroyOunce: '40.00' } },
      }),
    );
    const line = priced(q);
    expect(line.meltValue.amountMinor).toBe(480000);
    expect(line.payout.amountMinor).toBe(472000);
    expect(line.payoutRate).toMatchObject({ basis: 'under-spot', amountUnderSpotPerTroyOunce: '40.00', source: 'store', effectivePercentOfMelt: '98.33' });
  });

  it('pays zero when the amount under spot equals spot, and refuses one above spot', () => {
    const at = priceQuote(quote([{ kind: 'coin', coinType: 'us-1oz-silver-bullion', count: 1 }], { rateOverride: { basis: 'under-spot', amountPerTroyOunce: '30.00' } }));
    expect(priced(at).payout.amountMinor).toBe(0);
    // 31 U.S.C. 5112(e) (from memory): 31.103 g of .999 silver holds 0.999 ozt; 0.999 x 30.00 = 29.97
    expect(priced(at).margin.amountMinor).toBe(2997);
    const issues = issuesOf(quote([{ kind: 'coin', coinType: 'us-1oz-silver-bullion', count: 1, rateOverride: { basis: 'under-spot', amountPerTroyOunce: '31' } }]));
    expect(issues).toEqual([{ path: 'lines.0.rateOverride.amountPerTroyOunce', message: expect.stringMatching(/more than the silver spot/) }]);
  });

  it('prices a fine weight from an assay', () => {
    const line = priced(priceQuote(quote([{ kind: 'fine-weight', metal: 'gold', fineWeight: { value: '2', unit: 'ozt' } }])));
    expect(line.finenessSource).toBe('assay');
    expect(line.markedFineness).toBeNull();
    expect(line.fineWeightGrams).toBe('62.2070');
    expect(line.meltValue.amountMinor).toBe(480000);
    expect(line.payoutRate.rateCategory).toBe('gold-scrap');
  });
});

describe('rates and overrides', () => {
  it('applies a line override over a ticket override over the store rate, and says which', () => {
    const q = priceQuote(
      quote(
        [
          weightLine({ rateOverride: { basis: 'percent-of-melt', percent: '90' } }),
          weightLine(),
          weightLine({ mark: '925' }),
        ],
        { rateOverride: { basis: 'percent-of-melt', percent: '85' }, rates: { 'silver-scrap': { basis: 'percent-of-melt', percent: '60' } } },
      ),
    );
    expect(priced(q, 0).payoutRate).toMatchObject({ percent: '90', source: 'line-override' });
    expect(priced(q, 1).payoutRate).toMatchObject({ percent: '85', source: 'ticket-override' });
    expect(priced(q, 2).payoutRate).toMatchObject({ percent: '85', source: 'ticket-override' });
    const store = priceQuote(quote([weightLine({ mark: '925' })], { rates: { 'silver-scrap': { basis: 'percent-of-melt', percent: '60' } } }));
    expect(priced(store).payoutRate).toMatchObject({ percent: '60', source: 'store' });
  });
});

describe('totals and output', () => {
  it('totals melt, payout and margin, per metal too, and is plain JSON', () => {
    const q = priceQuote(quote([weightLine(), weightLine({ mark: '925' }), { kind: 'coin', coinType: 'us-90-dime', count: 10 }]));
    const sum = (f: (l: PricedLine) => number) => [0, 1, 2].map((i) => f(priced(q, i))).reduce((a, b) => a + b, 0);
    expect(q.totals.meltValue.amountMinor).toBe(sum((l) => l.meltValue.amountMinor));
    expect(q.totals.payout.amountMinor).toBe(sum((l) => l.payout.amountMinor));
    expect(q.totals.margin.amountMinor).toBe(q.totals.meltValue.amountMinor - q.totals.payout.amountMinor);
    expect(q.totals.byMetal.map((m) => m.metal)).toEqual(['gold', 'silver']);
    expect(JSON.parse(JSON.stringify(q))).toEqual(q);
    expect(q.spot.gold).toEqual({ perTroyOunce: SPOT.gold, perGram: '77.1618', perPennyweight: '120.0000' });
  });

  it('works in EUR and GBP', () => {
    const eur = priceQuote(quote([weightLine()], { currency: 'EUR', locale: 'de-DE' }));
    expect(priced(eur).meltValue.currency).toBe('EUR');
    expect(priced(eur).meltValue.formatted).toMatch(/€/);
    expect(priced(eur).meltValue.formatted).toMatch(/,\d\d/);
    const gbp = priceQuote(quote([weightLine()], { currency: 'GBP', locale: 'en-GB' }));
    expect(priced(gbp).meltValue.formatted).toBe(`£${priced(gbp).meltValue.decimal.replace(/\B(?=(\d{3})+(?!\d))/g, ',')}`);
  });
});

describe('validation', () => {
  it('names the field of every bad value', () => {
    const issues = issuesOf({
      spot: { gold: '0', silver: 'abc' },
      lines: [
        { kind: 'weight', mark: '14K', grossWeight: { value: '-1', unit: 'g' } },
        { kind: 'weight', mark: '14K', grossWeight: { value: '101', unit: 'kg' } },
        { kind: 'weight', fineness: '1.2', metal: 'gold', grossWeight: { value: 'NaN', unit: 'g' } },
        { kind: 'coin', coinType: 'unknown-coin', count: 2.5 },
        { kind: 'weight', mark: '14K', grossWeight: { value: '5', unit: 'oz' } },
      ],
    });
    const byPath = Object.fromEntries(issues.map((i) => [i.path, i.message]));
    expect(byPath['spot.gold']).toBe('must be greater than 0');
    expect(byPath['spot.silver']).toMatch(/decimal number/);
    expect(byPath['lines.0.grossWeight.value']).toBe('must not be negative');
    expect(byPath['lines.1.grossWeight.value']).toMatch(/over 100 kg/);
    expect(byPath['lines.2.fineness']).toMatch(/at most 1/);
    expect(byPath['lines.2.grossWeight.value']).toMatch(/decimal number/);
    expect(byPath['lines.3.coinType']).toBe('unknown coin type "unknown-coin"');
    expect(byPath['lines.3.count']).toMatch(/whole number/);
    expect(byPath['lines.4.grossWeight.unit']).toMatch(/avoirdupois/);
  });

  it('rejects NaN and Infinity given as numbers, and takes finite numbers by their written form', () => {
    expect(issuesOf(quote([weightLine({ grossWeight: { value: Number.NaN as unknown as string, unit: 'g' } })]))[0]!.path).toBe('lines.0.grossWeight.value');
    const ok = priceQuote(quote([weightLine({ grossWeight: { value: 10.5 as unknown as string, unit: 'g' } })]));
    expect(priced(ok).grossWeightGrams).toBe('10.5000');
  });

  it('names spot.<metal> when a line needs a spot that is missing', () => {
    expect(issuesOf({ spot: { gold: '2400' }, lines: [weightLine({ mark: '925' })] })).toEqual([
      { path: 'spot.silver', message: 'a silver spot price per troy ounce is needed: line 1 is silver' },
    ]);
  });

  it('refuses deductions larger than the gross weight, or that leave nothing', () => {
    expect(issuesOf(quote([weightLine({ deductions: [{ kind: 'grams', value: '11' }] })]))[0]!.path).toBe('lines.0.deductions.0.value');
    expect(issuesOf(quote([weightLine({ deductions: [{ kind: 'grams', value: '10' }] })]))[0]!.path).toBe('lines.0.deductions');
    expect(issuesOf(quote([weightLine({ deductions: [{ kind: 'percent', value: '101' }] })]))[0]!.path).toBe('lines.0.deductions.0.value');
    expect(issuesOf(quote([weightLine({ tare: { value: '10', unit: 'g' } })]))[0]!.path).toBe('lines.0.tare.value');
  });

  it('holds for a test a mark of another metal than the line states, and refuses a line with neither mark nor fineness', () => {
    // A line whose metal disagrees with its mark is needs-test with the mark's candidates, never priced (it was a 422).
    const held = priceQuote(quote([weightLine({ mark: '14K', metal: 'silver' })])).lines[0]!;
    expect(held.status).toBe('needs-test');
    expect(held.status === 'needs-test' && held.message).toMatch(/14 karat gold .* but the line says silver/);
    expect(issuesOf(quote([weightLine({ mark: undefined })]))[0]!.path).toBe('lines.0.mark');
    expect(issuesOf(quote([weightLine({ mark: undefined, fineness: '0.9' })]))[0]!.path).toBe('lines.0.metal');
  });

  it('refuses an assumed fineness above the mark or for an unknown key, and rates above 100%', () => {
    const paths = issuesOf(
      quote([weightLine()], {
        assumedFineness: { '14K': '0.6', 'no-such-mark': '0.5' },
        rates: { 'gold-scrap': { basis: 'percent-of-melt', percent: '101' } },
      }),
    ).map((i) => i.path);
    expect(paths).toEqual(expect.arrayContaining(['assumedFineness.14K', 'assumedFineness.no-such-mark', 'rates.gold-scrap.percent']));
  });

  it('refuses face value that no coins add up to', () => {
    expect(issuesOf(quote([{ kind: 'face-value', coinClass: 'us-90', faceValue: '1.03' }]))[0]!.path).toBe('lines.0.faceValue');
    expect(issuesOf(quote([{ kind: 'face-value', coinClass: 'us-40', faceValue: '1.00', basis: 'common-practice' }]))[0]!.path).toBe('lines.0.basis');
  });

  it('priceQuote throws a QuoteValidationError carrying the issues', () => {
    try {
      priceQuote({ lines: [{ kind: 'coin', coinType: 'us-90-dime', count: 0 }] });
      expect.unreachable();
    } catch (e) {
      expect(e).toBeInstanceOf(QuoteValidationError);
      expect((e as QuoteValidationError).issues).toEqual([{ path: 'lines.0.count', message: 'must be a whole number of coins, at least 1' }]);
    }
  });
});
