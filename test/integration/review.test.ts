import { describe, expect, it } from 'vitest';
import { getTicket, payTicket } from '@/features/counter/tickets.server';
import { dayInZone } from '@/features/counter/counter';
import { intakeForDay } from '@/features/review/review.server';
import { testDb } from '../support/db';
import { makeCounterWorld, setSpots } from '../support/counter';
import { acceptedTicket } from '../support/tickets';

const db = testDb();

describe("a manager's review of the day", () => {
  it('sums the day\u2019s paid tickets: melt value, payout and margin, counting nothing unpaid', async () => {
    const world = await makeCounterWorld(db);
    await setSpots(db, world, { gold: '2400.00', silver: '30.00' });
    const a = await acceptedTicket(db, world);
    const b = await acceptedTicket(db, world);
    await acceptedTicket(db, world); // accepted, not paid: not intake yet
    await payTicket(db, world.clerk, a.id, { method: 'check', checkNumber: '1' });
    await payTicket(db, world.clerk, b.id, { method: 'check', checkNumber: '2' });
    const [ta, tb] = [await getTicket(db, world.clerk, a.id), await getTicket(db, world.clerk, b.id)];
    const today = dayInZone(new Date(), 'America/New_York');
    const [intake] = await intakeForDay(db, world.storeId, 'America/New_York', today);
    expect(intake).toEqual({
      currency: 'USD',
      tickets: 2,
      meltValueMinor: ta.meltValueMinor + tb.meltValueMinor,
      payoutMinor: ta.payoutMinor + tb.payoutMinor,
      marginMinor: ta.marginMinor + tb.marginMinor,
    });
    expect(await intakeForDay(db, world.storeId, 'America/New_York', '2001-01-01')).toEqual([]);
  });
});
