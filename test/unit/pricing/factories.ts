import type { QuoteInput } from '@/features/pricing';

type AnyLine = QuoteInput['lines'][number];

export const SPOT = { gold: '2400.00', silver: '30.00', platinum: '1000.00', palladium: '1000.00' } as const;

export function weightLine(overrides: Partial<Extract<AnyLine, { kind: 'weight' }>> = {}): AnyLine {
  return { kind: 'weight', category: 'jewelry', mark: '14K', grossWeight: { value: '10.00', unit: 'g' }, ...overrides };
}

export function quote(lines: AnyLine[], overrides: Partial<QuoteInput> = {}): QuoteInput {
  return { currency: 'USD', spot: { ...SPOT }, lines, ...overrides };
}

const MARKS = ['14K', '10K', '18K', '925', 'Sterling', '585', '22K', '750', 'PT950', '1/20 14K GF', '24K', 'coin silver'];

/** A ticket of n mixed lines, as the counter builds it. */
export function mixedTicket(n: number): QuoteInput {
  const lines: AnyLine[] = [];
  for (let i = 0; i < n; i++) {
    const k = i % 10;
    if (k === 7) lines.push({ kind: 'coin', coinType: 'us-90-quarter', count: 1 + (i % 40) });
    else if (k === 8) lines.push({ kind: 'face-value', coinClass: 'us-90', faceValue: `${1 + (i % 9)}.25`, basis: 'common-practice' });
    else if (k === 9) lines.push({ kind: 'fine-weight', metal: 'gold', fineWeight: { value: `${i % 13}.5`, unit: 'g' } });
    else
      lines.push({
        kind: 'weight',
        category: i % 3 === 0 ? 'scrap' : 'jewelry',
        mark: MARKS[i % MARKS.length]!,
        grossWeight: { value: `${(i % 50) + 1}.${i % 100}`, unit: i % 4 === 0 ? 'dwt' : 'g' },
        ...(i % 5 === 0 ? { deductions: [{ kind: 'percent' as const, value: '12.5', reason: 'stones' }] } : {}),
      });
  }
  return quote(lines, { assumedFineness: { '14K': '0.575', '10K': '0.410' } });
}
