import { describe, expect, it } from 'vitest';
import { priceQuote, resolveRateCategory, type PricedLine, type RateCategory } from '@/features/pricing';

/**
 * 15 U.S.C. 295 (as amended by Pub. L. 94-450, 1976): a gold article assayed with its solder may be
 * up to seven one-thousandth parts below its mark (three for watchcases and flatware; three without
 * solder). The lowest fineness a marked article may lawfully assay at is therefore mark - 0.007.
 * A tested piece at that floor must stay in its karat's band.
 */
const WITH_SOLDER = 7; // thousandths, 15 U.S.C. 295

/** The floor of a mark in exact thousandths: karat k is 1000k/24. */
const floorOf = (thousandths: number) => thousandths - WITH_SOLDER;
const karat = (k: number) => (1000 * k) / 24;

function bandOf(tested: string): RateCategory {
  const q = priceQuote({
    spot: { gold: '2400.00' },
    lines: [{ kind: 'weight', category: 'jewelry', metal: 'gold', fineness: tested, grossWeight: { value: '10', unit: 'g' } }],
  });
  return (q.lines[0] as PricedLine).payoutRate.rateCategory;
}

function bandOfMark(mark: string): RateCategory {
  const q = priceQuote({ spot: { gold: '2400.00' }, lines: [{ kind: 'weight', category: 'jewelry', mark, grossWeight: { value: '10', unit: 'g' } }] });
  return (q.lines[0] as PricedLine).payoutRate.rateCategory;
}

describe('karat bands sit below the legal floor of 15 U.S.C. 295', () => {
  it('15 U.S.C. 295: 14K (583.3) may assay at 576.3 with solder and stays in the 14K band; so does 583 at 576', () => {
    expect(floorOf(karat(14))).toBeCloseTo(576.333, 3);
    expect(bandOf('0.5763')).toBe('gold-jewelry-14k-to-17k');
    expect(bandOf('0.576')).toBe('gold-jewelry-14k-to-17k');
    // 583 - 7 = 576: the 583 mark's floor is the band's edge.
    expect(floorOf(583)).toBe(576);
    expect(bandOf('0.5759')).toBe('gold-jewelry-below-14k');
    // The old edge of 0.580 dropped a lawful 14K piece tested at 0.577 into the lower band.
    expect(bandOf('0.577')).toBe('gold-jewelry-14k-to-17k');
  });

  it('15 U.S.C. 295: 18K (750) may assay at 743 with solder and stays in the 18K band', () => {
    expect(floorOf(750)).toBe(743);
    expect(bandOf('0.743')).toBe('gold-jewelry-18k-to-21k');
    expect(bandOf('0.7429')).toBe('gold-jewelry-14k-to-17k');
    expect(bandOf('0.744')).toBe('gold-jewelry-18k-to-21k');
  });

  it('15 U.S.C. 295: 22K (916.7) and the 916 mark may assay at 909 and stay in the 22K band', () => {
    expect(floorOf(karat(22))).toBeCloseTo(909.667, 3);
    expect(floorOf(916)).toBe(909);
    expect(bandOf('0.909')).toBe('gold-jewelry-22k-to-23k');
    expect(bandOf('0.9089')).toBe('gold-jewelry-18k-to-21k');
  });

  it('15 U.S.C. 295: fine gold marked 990 may assay at 983 and stays in the 24K band; 24K itself at 993', () => {
    expect(floorOf(990)).toBe(983);
    expect(floorOf(karat(24))).toBe(993);
    expect(bandOf('0.983')).toBe('gold-jewelry-24k');
    expect(bandOf('0.993')).toBe('gold-jewelry-24k');
    expect(bandOf('0.9829')).toBe('gold-jewelry-22k-to-23k');
  });

  it('each edge is above the karat below it, so no lower karat at its nominal fineness reaches the band', () => {
    // 13K = 541.7 < 576; 17K = 708.3 < 743; 21K = 875 < 909; 23K = 958.3 < 983.
    expect(bandOf('0.541667')).toBe('gold-jewelry-below-14k');
    expect(bandOf('0.708334')).toBe('gold-jewelry-14k-to-17k');
    expect(bandOf('0.875')).toBe('gold-jewelry-18k-to-21k');
    expect(bandOf('0.958334')).toBe('gold-jewelry-22k-to-23k');
  });

  it('marks band by their nominal fineness: 10K, 14K, 585, 18K, 750, 20K, 22K, 916, 23K, 24K, 999, AU 990', () => {
    expect(bandOfMark('10K')).toBe('gold-jewelry-below-14k');
    expect(bandOfMark('14K')).toBe('gold-jewelry-14k-to-17k');
    expect(bandOfMark('585')).toBe('gold-jewelry-14k-to-17k');
    expect(bandOfMark('18K')).toBe('gold-jewelry-18k-to-21k');
    expect(bandOfMark('750')).toBe('gold-jewelry-18k-to-21k');
    expect(bandOfMark('20K')).toBe('gold-jewelry-18k-to-21k');
    expect(bandOfMark('22K')).toBe('gold-jewelry-22k-to-23k');
    expect(bandOfMark('916')).toBe('gold-jewelry-22k-to-23k');
    expect(bandOfMark('23K')).toBe('gold-jewelry-22k-to-23k');
    expect(bandOfMark('24K')).toBe('gold-jewelry-24k');
    expect(bandOfMark('AU 999')).toBe('gold-jewelry-24k');
    expect(bandOfMark('AU 990')).toBe('gold-jewelry-24k');
  });
});

describe('bullion platinum and palladium are not paid at jewelry rates', () => {
  it('platinum and palladium bullion and coin have their own categories (common practice: bullion pays close to spot)', () => {
    const yes = { gte: () => true };
    expect(resolveRateCategory('platinum', 'bullion', yes)).toBe('platinum-bullion');
    expect(resolveRateCategory('platinum', 'coin', yes)).toBe('platinum-bullion');
    expect(resolveRateCategory('platinum', 'jewelry', yes)).toBe('platinum');
    expect(resolveRateCategory('palladium', 'bullion', yes)).toBe('palladium-bullion');
    expect(resolveRateCategory('palladium', 'coin', yes)).toBe('palladium-bullion');
    expect(resolveRateCategory('palladium', 'scrap', yes)).toBe('palladium');
  });

  it('platinum and palladium bullion coins of the catalogue pay the bullion rates', () => {
    const q = priceQuote({
      spot: { platinum: '1000.00', palladium: '1000.00' },
      lines: [
        { kind: 'coin', coinType: 'us-1oz-platinum-bullion', count: 1 },
        { kind: 'coin', coinType: 'ca-1oz-palladium-bullion', count: 1 },
      ],
    });
    expect((q.lines as PricedLine[]).map((l) => l.payoutRate.rateCategory)).toEqual(['platinum-bullion', 'palladium-bullion']);
  });

  it('a 1 ozt platinum bar pays its bullion rate, not the jewelry rate', () => {
    const q = priceQuote({
      spot: { platinum: '1000.00' },
      lines: [
        { kind: 'fine-weight', metal: 'platinum', category: 'bullion', fineWeight: { value: '1', unit: 'ozt' } },
        { kind: 'weight', category: 'jewelry', mark: 'PT950', grossWeight: { value: '31.1034768', unit: 'g' } },
      ],
    });
    const [bar, ring] = q.lines as PricedLine[];
    expect(bar!.payoutRate.rateCategory).toBe('platinum-bullion');
    expect(ring!.payoutRate.rateCategory).toBe('platinum');
    expect(Number(bar!.payoutRate.percent)).toBeGreaterThan(Number(ring!.payoutRate.percent));
  });
});
