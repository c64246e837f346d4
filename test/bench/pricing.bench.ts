import { bench, describe } from 'vitest';
import { parseMark, parseMarkUncached, priceQuote, priceQuoteUnchecked, validateQuoteInput, type ValidQuoteInput } from '@/features/pricing';
import { mixedTicket } from '../unit/pricing/factories';

function validated(n: number): ValidQuoteInput {
  const v = validateQuoteInput(mixedTicket(n));
  if (!v.ok) throw new Error(JSON.stringify(v.issues));
  return v.value;
}

const ticket50 = mixedTicket(50);
const ticket200 = mixedTicket(200);
const valid50 = validated(50);
const valid200 = validated(200);

const MARK_SAMPLES = ['14K', '14 kt', '18KP', '1/20 14K G.F.', 'Sterling', 'ster.', '925', '.925', '950', 'PT950', 'EPNS', 'nickel silver', '10k', '585', '999.9', 'Pd 500', 'coin', 'K18', '22K 916', 'xyz'];
const marks10k = Array.from({ length: 10_000 }, (_, i) => `${MARK_SAMPLES[i % MARK_SAMPLES.length]}${i % 3 === 0 ? '' : ' '.repeat(i % 3)}`);
const distinctMarks10k = Array.from({ length: 10_000 }, (_, i) => `${MARK_SAMPLES[i % MARK_SAMPLES.length]} #${i}`);

describe('pricing', () => {
  bench('priceQuoteUnchecked, 50 lines (validated once)', () => {
    priceQuoteUnchecked(valid50);
  });
  bench('priceQuoteUnchecked, 200 lines (validated once)', () => {
    priceQuoteUnchecked(valid200);
  });
  bench('priceQuote (zod validation + pricing), 50 lines', () => {
    priceQuote(ticket50);
  });
  bench('priceQuote (zod validation + pricing), 200 lines', () => {
    priceQuote(ticket200);
  });
});

describe('marks', () => {
  bench('parseMark (cached), 10,000 marks', () => {
    for (const m of marks10k) parseMark(m);
  });
  bench('parseMarkUncached, 10,000 marks', () => {
    for (const m of marks10k) parseMarkUncached(m);
  });
  bench('parseMark, 10,000 distinct marks (cache misses)', () => {
    for (const m of distinctMarks10k) parseMark(m);
  });
});
