import { describe, expect, it } from 'vitest';
import { fromCounterLine, newGradingLine, toCounterLine } from '@/features/counter/grading';
import { faceValueBasisLine, priceTicket } from '@/features/counter/ticket-pricing';
import { saveLinesSchema } from '@/features/counter/counter.schema';
import { FACE_VALUE_CLASSES } from '@/features/pricing/coins';
import type { PricedLine } from '@/features/pricing/pricing';

/** A face-value line as the clerk enters it, priced the way the island and the server price it. */
function priceAtCounter(coinClass: string, faceValue: string) {
  const converted = toCounterLine(newGradingLine({ kind: 'face-value', category: 'coin', coinClass, faceValue }));
  if (!converted.ok) throw new Error(converted.prompt);
  const ticket = priceTicket({
    currency: 'USD',
    spot: { silver: '30.00' },
    rates: {},
    assumedFineness: {},
    ticketRaisePoints: '0',
    lines: [{ item: converted.payload.item, raisePoints: '0' }],
  });
  return { item: converted.payload.item, line: ticket.lines[0]! };
}

describe('face value at the counter', () => {
  it('prices 40% halves by face value (1965-1970) instead of refusing the basis', () => {
    const { line } = priceAtCounter('us-40', '10.00');
    expect(line.inputIssues).toEqual([]);
    expect(line.problem).toBeNull();
    const r = line.result as PricedLine;
    // US Mint (from memory): a half dollar of 1965-1970 is 11.50 g at 40% silver, so 1.00 face is 2 x 4.60 g = 0.2958 ozt.
    expect(r.fineWeightTroyOunces).toBe('2.958000');
    expect(r.meltValue.amountMinor).toBe(8874); // 2.958 ozt x 30.00
  });
});

describe('the basis the counter sends', () => {
  it('is one the class has, for every class, so every face-value line the clerk enters is priced', () => {
    for (const cls of FACE_VALUE_CLASSES) {
      const { item, line } = priceAtCounter(cls.coinClass, '1.00');
      expect(item.basis, cls.coinClass).toBe(cls.counterBasis);
      expect(line.inputIssues, cls.coinClass).toEqual([]);
      expect((line.result as PricedLine).faceValue!.basis).toBe(cls.counterBasis);
    }
  });

  it("keeps the clerk's choice only where the class has that figure", () => {
    const choose = (coinClass: string, faceBasis: 'mint-weight' | 'common-practice') => {
      const c = toCounterLine(newGradingLine({ kind: 'face-value', coinClass, faceValue: '1.00', faceBasis }));
      return c.ok ? c.payload.item.basis : null;
    };
    expect(choose('us-90', 'mint-weight')).toBe('mint-weight');
    expect(choose('us-90', 'common-practice')).toBe('common-practice');
    expect(choose('us-40', 'common-practice')).toBe('mint-weight');
  });

  it('comes back into the editor from a saved line', () => {
    const saved = { item: { kind: 'face-value', coinClass: 'us-90', faceValue: '4.00', basis: 'mint-weight' }, testMethod: 'none' as const, testResult: null, note: null, raisePoints: '0' };
    expect(fromCounterLine(saved)).toMatchObject({ kind: 'face-value', coinClass: 'us-90', faceValue: '4.00', faceBasis: 'mint-weight' });
  });

  it('is filled in on the server from the class when an API caller leaves it out', () => {
    const parsed = saveLinesSchema.parse({ lines: [{ item: { kind: 'face-value', coinClass: 'us-40', faceValue: '5.00' } }] });
    expect(parsed.lines[0]!.item).toMatchObject({ coinClass: 'us-40', basis: 'mint-weight' });
    const chosen = saveLinesSchema.parse({ lines: [{ item: { kind: 'face-value', coinClass: 'us-90', faceValue: '5.00', basis: 'mint-weight' } }] });
    expect(chosen.lines[0]!.item).toMatchObject({ basis: 'mint-weight' });
  });

  it('shows on the line as the per-dollar figure and its basis', () => {
    expect(faceValueBasisLine(priceAtCounter('us-40', '10.00').line.result as PricedLine)).toBe('0.2958 ozt per 1.00 face, mint weight');
    expect(faceValueBasisLine(priceAtCounter('us-90', '10.00').line.result as PricedLine)).toBe('0.715 ozt per 1.00 face, circulated, common practice');
    expect(faceValueBasisLine(null)).toBeNull();
  });
});
