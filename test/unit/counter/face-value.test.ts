import { describe, expect, it } from 'vitest';
import { newGradingLine, toCounterLine } from '@/features/counter/grading';
import { priceTicket } from '@/features/counter/ticket-pricing';
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
