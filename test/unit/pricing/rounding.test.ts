import { describe, expect, it } from 'vitest';
import { priceQuote, ROUNDING_RULE, type PricedLine, type PricedQuote } from '@/features/pricing';
import { quote } from './factories';

const line = (q: PricedQuote, i = 0) => q.lines[i] as PricedLine;
const assay = (value: string, unit: 'g' | 'ozt' = 'ozt') => ({ kind: 'fine-weight' as const, metal: 'gold' as const, fineWeight: { value, unit } });
const half = { basis: 'percent-of-melt' as const, percent: '50' };

describe('rounding: half-up, once per line, to the minor unit', () => {
  it('states its rule', () => {
    expect(ROUNDING_RULE).toMatch(/half-up/);
  });

  it('USD: an exact half cent rounds up; just under half rounds down', () => {
    // 1 ozt x 10.005 = 10.005 USD = 1000.5 cents
    expect(line(priceQuote(quote([assay('1')], { spot: { gold: '10.005' } }))).meltValue.amountMinor).toBe(1001);
    // 1 ozt x 10.0049999 = 1000.49999 cents
    expect(line(priceQuote(quote([assay('1')], { spot: { gold: '10.0049999' } }))).meltValue.amountMinor).toBe(1000);
    // payout 50% of 10.01 = 5.005 -> 5.01
    const q = priceQuote(quote([{ ...assay('1'), rateOverride: half }], { spot: { gold: '10.01' } }));
    expect(line(q).meltValue.amountMinor).toBe(1001);
    expect(line(q).payout.amountMinor).toBe(501);
    expect(line(q).margin.amountMinor).toBe(500);
  });

  it('payout is rounded from the exact melt value, not from the rounded melt', () => {
    // melt 0.046 -> 0.05; 10% of the exact melt = 0.0046 -> 0.00, whereas 10% of the rounded 0.05 = 0.005 -> 0.01
    const q = priceQuote(quote([{ ...assay('1'), rateOverride: { basis: 'percent-of-melt', percent: '10' } }], { spot: { gold: '0.046' } }));
    expect(line(q).meltValue.amountMinor).toBe(5);
    expect(line(q).payout.amountMinor).toBe(0);
    expect(line(q).margin.amountMinor).toBe(5);
  });

  it('keeps karat exact through to the half cent: 12 ozt of 14K is 7 ozt fine', () => {
    // 12 x 14/24 = 7 ozt; 7 x 1.005 = 7.035 USD = 703.5 cents -> 704. With 0.583333 it would be 703.
    const q = priceQuote(quote([{ kind: 'weight', category: 'scrap', mark: '14K', grossWeight: { value: '12', unit: 'ozt' } }], { spot: { gold: '1.005' } }));
    expect(line(q).fineWeightTroyOunces).toBe('7.000000');
    expect(line(q).meltValue.amountMinor).toBe(704);
  });

  it('JPY (no minor digits): an exact half yen rounds up', () => {
    const q = priceQuote(quote([{ ...assay('1'), rateOverride: half }], { currency: 'JPY', locale: 'ja-JP', spot: { gold: '1001' } }));
    expect(line(q).meltValue.amountMinor).toBe(1001);
    expect(line(q).payout.amountMinor).toBe(501); // 500.5 -> 501
    expect(line(q).meltValue.decimal).toBe('1001');
    expect(line(q).meltValue.formatted).toMatch(/1,001/);
    const tie = priceQuote(quote([assay('0.5')], { currency: 'JPY', spot: { gold: '3' } }));
    expect(line(tie).meltValue.amountMinor).toBe(2); // 1.5 -> 2
  });

  it('totals are sums of rounded lines, so the receipt adds up even where unrounded sums differ', () => {
    // three lines of 0.005 USD each: each rounds to 0.01, total 0.03; rounding the unrounded sum 0.015 would give 0.02
    const q = priceQuote(quote([assay('1'), assay('1'), assay('1')], { spot: { gold: '0.005' } }));
    expect(q.lines.map((l) => (l as PricedLine).meltValue.amountMinor)).toEqual([1, 1, 1]);
    expect(q.totals.meltValue.amountMinor).toBe(3);
    expect(q.totals.meltValue.formatted).toBe('$0.03');
    const payouts = q.lines.map((l) => (l as PricedLine).payout.amountMinor);
    expect(q.totals.payout.amountMinor).toBe(payouts.reduce((a, b) => a + b, 0));
    expect(q.totals.margin.amountMinor).toBe(q.totals.meltValue.amountMinor - q.totals.payout.amountMinor);
  });
});
