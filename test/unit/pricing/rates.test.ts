import { describe, expect, it } from 'vitest';
import {
  DEFAULT_RATES,
  RATE_CATEGORIES,
  RATE_CATEGORY_LABELS,
  assumedFinenessSchema,
  priceQuote,
  ratesSchema,
  safePriceQuote,
  type PricedLine,
} from '@/features/pricing';

describe('rate categories', () => {
  it('every category has a default rate and a label, and no two share a label', () => {
    for (const c of RATE_CATEGORIES) {
      expect(DEFAULT_RATES[c]).toBeDefined();
      expect(RATE_CATEGORY_LABELS[c]).toMatch(/\w/);
    }
    expect(new Set(Object.values(RATE_CATEGORY_LABELS)).size).toBe(RATE_CATEGORIES.length);
  });

  it('a rate saved for the old 18K-and-above band applies to 18K-21K, 22K-23K and 24K unless they have their own', () => {
    const old = { basis: 'percent-of-melt', percent: '85' };
    const own = { basis: 'percent-of-melt', percent: '88' };
    const parsed = ratesSchema.parse({ 'gold-jewelry-18k-and-above': old, 'gold-jewelry-24k': own, 'silver-scrap': old });
    expect(parsed).toEqual({ 'gold-jewelry-18k-to-21k': old, 'gold-jewelry-22k-to-23k': old, 'gold-jewelry-24k': own, 'silver-scrap': old });
    const q = priceQuote({
      spot: { gold: '2400' },
      rates: { 'gold-jewelry-18k-and-above': old },
      lines: ['18K', '22K', '24K'].map((mark) => ({ kind: 'weight', mark, grossWeight: { value: '1', unit: 'g' } })),
    });
    expect((q.lines as PricedLine[]).map((l) => [l.payoutRate.rateCategory, l.payoutRate.percent, l.payoutRate.source])).toEqual([
      ['gold-jewelry-18k-to-21k', '85', 'store'],
      ['gold-jewelry-22k-to-23k', '85', 'store'],
      ['gold-jewelry-24k', '85', 'store'],
    ]);
  });

  it('still refuses a category it does not know', () => {
    expect(ratesSchema.safeParse({ 'gold-jewelry-99k': { basis: 'percent-of-melt', percent: '80' } }).success).toBe(false);
  });
});

describe('paid-on fineness keys', () => {
  it('refuses a number of several metals as a key and names the keys to use', () => {
    const r = safePriceQuote({ spot: { gold: '2400' }, assumedFineness: { '990': '0.985' }, lines: [] });
    expect(r.ok).toBe(false);
    if (!r.ok) {
      expect(r.issues[0]!.path).toBe('assumedFineness.990');
      expect(r.issues[0]!.message).toMatch(/AU990, AG990, PT990, PD990/);
      expect(r.issues[0]!.message).toMatch(/AU990 is what "990" meant before/);
    }
  });

  it('takes the metal-named keys and pays on them', () => {
    expect(assumedFinenessSchema.parse({ AU990: '0.985', AG800: '0.79' })).toEqual({ AU990: '0.985', AG800: '0.79' });
    const line = priceQuote({
      spot: { gold: '2400' },
      assumedFineness: { AU990: '0.985' },
      lines: [{ kind: 'weight', mark: 'AU 990', grossWeight: { value: '10', unit: 'g' } }],
    }).lines[0] as PricedLine;
    expect([line.paidOnFinenessExact, line.finenessSource]).toEqual(['0.985', 'assumed']);
  });
});
