import { describe, expect, it } from 'vitest';
import { parseMark, priceQuote, resolveMarkForMetal, type PricedLine, type QuoteLine, type UnpricedLine } from '@/features/pricing';

/**
 * The preview body a new user sends: spot gold 2400 and silver 30, 10 g of one marked item.
 * Before the fix, AG 990 and S990 were paid as gold (626.40), 750 silver as 18K gold,
 * 14K silver as gold and 925 gold as silver.
 */
function preview(mark: string, extra: Record<string, unknown> = {}): QuoteLine {
  const q = priceQuote({
    spot: { gold: '2400.00', silver: '30.00', platinum: '1000.00', palladium: '1000.00' },
    lines: [{ kind: 'weight', category: 'jewelry', mark, grossWeight: { value: '10', unit: 'g' }, ...extra }],
  });
  return q.lines[0]!;
}

const metals = (line: QuoteLine) => (line as UnpricedLine).mark.candidates.map((c) => c.metal).sort();

describe('a mark never crosses metals (preview engine)', () => {
  it.each(['AG 990', 'S990', 'Ag990', '990 AG', 'ag.990', '.990 silver'])('%j is silver 0.990, not gold', (mark) => {
    const line = preview(mark) as PricedLine;
    expect(line.status).toBe('priced');
    expect(line.metal).toBe('silver');
    expect(line.markedFinenessExact).toBe('0.990');
    // 10 g x 0.990 / 31.1034768 g x 30.00 = 9.5488... -> 9.55 melt; silver jewelry is silver scrap at 70% (common practice) -> 6.68.
    expect(line.meltValue.decimal).toBe('9.55');
    expect(line.payout.decimal).toBe('6.68');
    expect(line.payoutRate.rateCategory).toBe('silver-scrap');
  });

  it.each([
    ['750 silver', 'silver', ['gold']],
    ['silver 750', 'silver', ['gold']],
    ['14K silver', 'silver', ['gold']],
    ['Silver 14kt', 'silver', ['gold']],
    ['925 gold', 'gold', ['silver']],
    ['AU 925', 'gold', ['silver']],
    ['PT 585', 'platinum', ['gold']],
    ['585 Pd', 'palladium', ['gold']],
    ['gold coin', 'gold', ['silver']],
    ['sterling gold', 'gold', ['silver']],
  ] as const)('%j names %s but its number or karat is of another metal: held for a test, never priced', (mark, named, numberMetals) => {
    const reading = parseMark(mark);
    expect(reading.kind).toBe('needs-test');
    expect(reading.reason).toBe('metal-conflict');
    expect(reading.namedMetals).toContain(named);
    for (const lineMetal of [undefined, 'gold', 'silver', 'platinum', 'palladium'] as const) {
      const line = preview(mark, lineMetal ? { metal: lineMetal } : {});
      expect(line.status).toBe('needs-test');
      expect(metals(line)).toEqual(expect.arrayContaining([...numberMetals]));
      expect((line as UnpricedLine).message).toMatch(new RegExp(named, 'i'));
      expect((line as UnpricedLine).message).toMatch(/test/i);
      expect(resolveMarkForMetal(reading, lineMetal)).toBeUndefined();
    }
  });

  it('says plainly what does not fit: 750 silver', () => {
    const line = preview('750 silver') as UnpricedLine;
    expect(line.message).toBe('The mark names silver, but 750 is a fineness of gold, not of silver. Test it before pricing.');
  });

  it('a line whose metal disagrees with a clear mark is held for a test with the candidates (it used to be a 422)', () => {
    for (const [mark, metal, markMetal] of [
      ['14K', 'silver', 'gold'],
      ['925', 'gold', 'silver'],
      ['Sterling', 'platinum', 'silver'],
      ['PT950', 'palladium', 'platinum'],
      ['AG 990', 'gold', 'silver'],
    ] as const) {
      const line = preview(mark, { metal }) as UnpricedLine;
      expect(line.status).toBe('needs-test');
      expect(line.mark.candidates.map((c) => c.metal)).toEqual([markMetal]);
      expect(line.message).toMatch(new RegExp(`line says ${metal}`));
    }
  });

  it('a number of several metals is never guessed: 990, 800 and 833 come back with all their metals', () => {
    expect(metals(preview('990'))).toEqual(['gold', 'palladium', 'platinum', 'silver']);
    expect(metals(preview('800'))).toEqual(['gold', 'silver']);
    expect(metals(preview('833'))).toEqual(['gold', 'silver']);
    expect(preview('990').status).toBe('needs-test');
    // The line's metal picks among the number's own metals...
    const gold990 = preview('990', { metal: 'gold' }) as PricedLine;
    expect([gold990.status, gold990.metal, gold990.markedFinenessExact]).toEqual(['priced', 'gold', '0.990']);
    const silver800 = preview('800', { metal: 'silver' }) as PricedLine;
    expect([silver800.status, silver800.metal]).toEqual(['priced', 'silver']);
    // ...and a metal the number is not a fineness of is held for a test.
    const line = preview('800', { metal: 'platinum' }) as UnpricedLine;
    expect(line.status).toBe('needs-test');
    expect(line.message).toMatch(/line says platinum/);
  });

  it('unqualified "gold" claims 24 karat (16 CFR 23.4, from memory) and is held for a test, not paid as 24K on its word', () => {
    for (const mark of ['gold', 'GOLD', 'Oro', 'AU']) {
      const reading = parseMark(mark);
      expect(reading.kind).toBe('needs-test');
      expect(reading.candidates.map((c) => c.key)).toEqual(['24K']);
      expect(reading.notes.join(' ')).toMatch(/16 CFR 23\.4/);
      const line = preview(mark, { metal: 'gold' });
      expect(line.status).toBe('needs-test');
    }
  });

  it('a tested fineness still prices a conflicting mark, on the test, saying so', () => {
    const line = preview('750 silver', { metal: 'silver', fineness: '0.925' }) as PricedLine;
    expect(line.status).toBe('priced');
    expect(line.metal).toBe('silver');
    expect(line.finenessSource).toBe('test');
    expect(line.notes.join(' ')).toMatch(/priced on the test/);
  });

  it('unpriced lines add nothing to the totals', () => {
    const q = priceQuote({
      spot: { gold: '2400.00', silver: '30.00' },
      lines: ['AG 990', '750 silver', '14K silver', '925 gold'].map((mark) => ({ kind: 'weight', mark, grossWeight: { value: '10', unit: 'g' } })),
    });
    expect(q.totals.pricedLineCount).toBe(1);
    expect(q.totals.unpricedLineCount).toBe(3);
    expect(q.totals.payout.decimal).toBe('6.68');
    expect(q.totals.byMetal.map((m) => m.metal)).toEqual(['silver']);
  });
});
