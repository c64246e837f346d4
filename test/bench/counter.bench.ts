import { bench, describe } from 'vitest';
import { newGradingLine, toCounterLine, type GradingLine } from '@/features/counter/grading';
import { priceTicket } from '@/features/counter/ticket-pricing';

// What the grading island does on each keystroke: turn the typed fields into engine input, price every line.
function ticket(lines: number): GradingLine[] {
  const marks = ['14K', '18K', '10K', '925', 'STERLING', '22K', 'PT950', '585'];
  return Array.from({ length: lines }, (_, i) =>
    i % 5 === 4
      ? newGradingLine({ kind: 'coin', coinType: 'us-90-quarter', count: String(10 + i) })
      : newGradingLine({ mark: marks[i % marks.length]!, grossValue: `${(i % 17) + 1}.${i % 10}5`, deductionGrams: i % 3 === 0 ? '0.2' : '' }),
  );
}

function reprice(lines: GradingLine[]) {
  const ready = lines.map(toCounterLine).flatMap((c) => (c.ok ? [c.payload] : []));
  return priceTicket({
    currency: 'USD',
    spot: { gold: '2400.00', silver: '30.00', platinum: '950.00', palladium: '1000.00' },
    rates: {},
    assumedFineness: { '14K': '0.575' },
    ticketRaisePoints: '0',
    lines: ready.map((p) => ({ item: p.item, raisePoints: p.raisePoints })),
  });
}

describe('grading island re-price (target: under 16 ms for 50 lines)', () => {
  const fifty = ticket(50);
  const twoHundred = ticket(200);
  bench('50-line ticket, every line priced', () => {
    reprice(fifty);
  });
  bench('200-line ticket, every line priced', () => {
    reprice(twoHundred);
  });
});
