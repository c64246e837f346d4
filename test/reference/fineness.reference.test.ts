import { describe, expect, it } from 'vitest';
import { markCandidateByKey, parseMark, priceQuote, US_MARKING_TOLERANCE, type PricedLine } from '@/features/pricing';

describe('standard finenesses', () => {
  // ISO 9202 / Hallmarking Convention standard finenesses (from memory; as listed in the trade brief):
  // gold 375, 585, 750, 916, 990, 999; silver 800, 925, 958, 999; platinum 850, 900, 950, 999; palladium 500, 950, 999.
  const standard: Record<string, string[]> = {
    gold: ['375', '585', '750', '916', '990', '999'],
    silver: ['800', '925', '958', '999'],
    platinum: ['850', '900', '950', '999'],
    palladium: ['500', '950', '999'],
  };
  for (const [metal, numbers] of Object.entries(standard)) {
    it.each(numbers)(`ISO 9202 / Hallmarking Convention: ${metal} %s is in the catalogue at its parts per thousand`, (num) => {
      const sym = { gold: 'AU', silver: 'AG', platinum: 'PT', palladium: 'PD' }[metal]!;
      const c = markCandidateByKey(num) ?? markCandidateByKey(`${sym}${num}`);
      expect(c?.metal).toBe(metal);
      expect(c?.finenessExact).toBe(`0.${num}`);
      const withSymbol = parseMark(`${sym} ${num}`);
      expect(withSymbol.kind).toBe('solid');
      expect(withSymbol.metal).toBe(metal);
    });
  }

  it('karat is parts in 24 (common definition): 9K = 0.375, 14K = 14/24, 18K = 0.75, 22K = 22/24, 24K = 1', () => {
    expect(parseMark('9K').fineness).toBe('0.375');
    expect(parseMark('14K').finenessExact).toBe('14/24');
    expect(parseMark('18K').fineness).toBe('0.75');
    expect(parseMark('22K').fineness).toBe('0.916667');
    expect(parseMark('24K').fineness).toBe('1');
  });
});

describe('FTC Jewelry Guides, 16 CFR Part 23', () => {
  // 16 CFR 23.5 (numbering after the 2018 revision; 23.6 before it): "solid silver", "sterling silver", "sterling"
  // or "Ster." only for at least 925/1,000 pure silver; "coin" or "coin silver" only for at least 900/1,000.
  it('16 CFR 23.5: sterling and ster. mean at least 925', () => {
    expect(parseMark('Sterling').fineness).toBe('0.925');
    expect(parseMark('Ster.').fineness).toBe('0.925');
  });
  it('16 CFR 23.5: coin and coin silver mean at least 900', () => {
    expect(parseMark('Coin Silver').fineness).toBe('0.9');
    expect(parseMark('Coin').fineness).toBe('0.9');
  });
  it('16 CFR 23.5: unqualified "silver" needs a fineness beside it, so it is not read as a fineness', () => {
    expect(parseMark('Silver').kind).toBe('needs-test');
  });
  // 16 CFR 23.7 (platinum group metals), from memory: unqualified "platinum" for at least 950/1,000 platinum.
  it('16 CFR 23.7 (from memory): unqualified platinum is read at 950', () => {
    expect(parseMark('Platinum').fineness).toBe('0.95');
  });
});

describe('US marking tolerances: the documented reason for an assumed fineness', () => {
  // 15 U.S.C. 294 forbids trading falsely marked gold or silver "according to the standards" of 295 and 296.
  // 15 U.S.C. 295 (as amended by Pub. L. 94-450, 1976): gold not less than the mark by more than three
  // one-thousandth parts tested without solder; with solder, three (watchcases, flatware) or seven (other articles).
  it('15 U.S.C. 295: gold tolerances of 3/1000 and 7/1000', () => {
    expect(US_MARKING_TOLERANCE.goldWithoutSolder).toBe('0.003');
    expect(US_MARKING_TOLERANCE.goldWithSolderWatchcaseOrFlatware).toBe('0.003');
    expect(US_MARKING_TOLERANCE.goldWithSolderOther).toBe('0.007');
  });
  // 15 U.S.C. 296: silver, from memory 4/1000.
  it('15 U.S.C. 296 (from memory): silver tolerance 4/1000', () => {
    expect(US_MARKING_TOLERANCE.silver).toBe('0.004');
  });
  it('an assumed fineness at the legal floor is accepted and paid on (14K - 7/1000 = 0.576333...)', () => {
    const floor = '0.576333';
    const q = priceQuote({
      spot: { gold: '2400' },
      assumedFineness: { '14K': floor },
      lines: [{ kind: 'weight', mark: '14K', grossWeight: { value: '100', unit: 'g' } }],
    });
    const line = q.lines[0] as PricedLine;
    expect(line.markedFinenessExact).toBe('14/24');
    expect(line.paidOnFineness).toBe(floor);
    expect(line.fineWeightGrams).toBe('57.6333');
  });
});
