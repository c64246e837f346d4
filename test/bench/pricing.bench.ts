import { bench, describe } from 'vitest';
import {
  clearPricingCaches,
  parseMark,
  parseMarkUncached,
  priceQuote,
  priceQuoteUnchecked,
  validateQuoteInput,
  type ValidQuoteInput,
} from '@/features/pricing';
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

/** One keystroke: line 0's gross weight changes, every other line is as before. */
function keystroke(valid: ValidQuoteInput, i: number): ValidQuoteInput {
  const first = valid.lines[0]!;
  if (first.kind !== 'weight') throw new Error('first line must be a weight line');
  const grams = `${10 + (i % 100_000) / 1000}`;
  return { ...valid, lines: [{ ...first, grossWeight: { value: grams, unit: 'g', grams } }, ...valid.lines.slice(1)] };
}
let typed = 0;

const MARK_SAMPLES = ['14K', '14 kt', '18KP', '1/20 14K G.F.', 'Sterling', 'ster.', '925', '.925', '950', 'PT950', 'EPNS', 'nickel silver', '10k', '585', '999.9', 'Pd 500', 'coin', 'K18', '22K 916', 'xyz'];
const marks10k = Array.from({ length: 10_000 }, (_, i) => `${MARK_SAMPLES[i % MARK_SAMPLES.length]}${' '.repeat(i % 3)}`);
const distinctMarks10k = Array.from({ length: 10_000 }, (_, i) => `${MARK_SAMPLES[i % MARK_SAMPLES.length]} #${i}`);

describe('pricing a ticket', () => {
  bench('cold: priceQuoteUnchecked, 50 lines (caches cleared)', () => {
    clearPricingCaches();
    priceQuoteUnchecked(valid50);
  });
  bench('cold: priceQuoteUnchecked, 200 lines (caches cleared)', () => {
    clearPricingCaches();
    priceQuoteUnchecked(valid200);
  });
  bench('keystroke: priceQuoteUnchecked, 50 lines, one line changed', () => {
    priceQuoteUnchecked(keystroke(valid50, typed++));
  });
  bench('keystroke: priceQuoteUnchecked, 200 lines, one line changed', () => {
    priceQuoteUnchecked(keystroke(valid200, typed++));
  });
  bench('cold: priceQuote (zod validation + pricing), 50 lines', () => {
    clearPricingCaches();
    priceQuote(ticket50);
  });
  bench('cold: priceQuote (zod validation + pricing), 200 lines', () => {
    clearPricingCaches();
    priceQuote(ticket200);
  });
});

describe('reading marks', () => {
  bench('parseMark, 10,000 marks (20 distinct, cached)', () => {
    for (const m of marks10k) parseMark(m);
  });
  bench('parseMarkUncached, 10,000 marks', () => {
    for (const m of marks10k) parseMarkUncached(m);
  });
  bench('parseMark, 10,000 distinct marks (all cache misses)', () => {
    for (const m of distinctMarks10k) parseMark(m);
  });
});
