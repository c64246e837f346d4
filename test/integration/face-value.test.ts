import { describe, expect, it } from 'vitest';
import { saveLinesSchema } from '@/features/counter/counter.schema';
import { newGradingLine, toCounterLine } from '@/features/counter/grading';
import { acceptTicket, createTicket, getTicket, quoteTicket, saveLines } from '@/features/counter/tickets.server';
import { buildReceipt, receiptPlainText } from '@/features/receipts/receipt';
import { priceQuote } from '@/features/pricing/pricing';
import { testDb } from '../support/db';
import { SIGNATURE, makeCounterWorld, setSpots } from '../support/counter';

const db = testDb();

/** The line the island sends for coin counted by face value. */
function counterPayload(coinClass: string, faceValue: string) {
  const c = toCounterLine(newGradingLine({ kind: 'face-value', category: 'coin', coinClass, faceValue }));
  if (!c.ok) throw new Error(c.prompt);
  return c.payload;
}

describe('coin by face value through the ticket service', () => {
  it('saves 40% halves by face value as the counter sends them, prices them on the server on mint weight, and the receipt says so', async () => {
    const world = await makeCounterWorld(db);
    await setSpots(db, world, { silver: '30.00' });
    const t = await createTicket(db, world.clerk, world.storeId, { sellerId: world.sellerId, doNotBuyOverrideReason: null });
    // The body goes through the same schema as POST /api/tickets/:id/lines.
    await saveLines(db, world.clerk, t.id, saveLinesSchema.parse(JSON.parse(JSON.stringify({ lines: [counterPayload('us-40', '10.00')], ticketRaisePoints: '0' }))));

    const view = await getTicket(db, world.clerk, t.id);
    const engine = priceQuote({ currency: 'USD', spot: { silver: '30.00' }, lines: [{ kind: 'face-value', coinClass: 'us-40', faceValue: '10.00', basis: 'mint-weight' }] });
    const line = view.lines[0]!;
    expect(line.pricingProblem).toBeNull();
    // 10.00 face x 0.2958 ozt (US Mint specifications, from memory) = 2.958 ozt; x 30.00 = 88.74; 85% of melt = 75.43
    expect(line.meltValueMinor).toBe(8874);
    expect(line.payoutMinor).toBe(7543);
    expect(view.payoutMinor).toBe(engine.totals.payout.amountMinor);
    expect(line.fineWeightTroyOunces).toBe('2.958000');
    expect((line.input as { item: { basis: string } }).item.basis).toBe('mint-weight');

    expect((await quoteTicket(db, world.clerk, t.id)).state).toBe('quoted');
    await acceptTicket(db, world.clerk, t.id, { signatureSvg: SIGNATURE });
    const receipt = buildReceipt(await getTicket(db, world.clerk, t.id));
    expect(receipt.lines[0]!.basis).toBe('10.00 face at 0.2958 ozt per 1.00 face, mint weight');
    expect(receiptPlainText(receipt).replace(/\s+/g, ' ')).toContain('Counted: 10.00 face at 0.2958 ozt per 1.00 face, mint weight');
  });

  it('records the class basis for an API line that names none, and refuses one the class has no figure for with 422 naming the field', async () => {
    const world = await makeCounterWorld(db);
    await setSpots(db, world, { silver: '30.00' });
    const t = await createTicket(db, world.clerk, world.storeId, { sellerId: world.sellerId, doNotBuyOverrideReason: null });
    await saveLines(db, world.clerk, t.id, saveLinesSchema.parse({ lines: [{ item: { kind: 'face-value', coinClass: 'us-35', faceValue: '5.00' } }] }));
    const saved = await getTicket(db, world.clerk, t.id);
    expect((saved.lines[0]!.input as { item: { basis: string } }).item.basis).toBe('mint-weight');
    expect(saved.lines[0]!.payoutMinor).toBe(14348); // 5.00 face x 1.1253 ozt x 30.00 = 168.795 melt; 85% = 143.48

    const bad = saveLinesSchema.parse({ lines: [{ item: { kind: 'face-value', coinClass: 'us-40', faceValue: '1.00', basis: 'common-practice' } }] });
    await expect(saveLines(db, world.clerk, t.id, bad)).rejects.toMatchObject({ status: 422, issues: [{ path: 'lines.0.item.basis', message: 'us-40 has no common-practice figure; use mint-weight' }] });
    expect((await getTicket(db, world.clerk, t.id)).lines.map((l) => l.payoutMinor)).toEqual([14348]);
  });
});
