import { spotPrices } from '@/db/schema';
import type { Db } from '@/db/client';
import { loadActiveUser, type SessionUser } from '@/features/auth/users.server';
import { enterSpot } from '@/features/counter/spot.server';
import { repriceOpenTickets } from '@/features/counter/tickets.server';
import { setStoreSetting } from '@/features/settings/settings.server';
import type { Metal } from '@/features/pricing/metals';
import { makeSeller, makeStore, makeUser } from './db';

export interface CounterWorld {
  storeId: string;
  storeCode: string;
  clerk: SessionUser;
  manager: SessionUser;
  sellerId: string;
}

/** A store with a clerk, a manager and an eligible seller; settings and spots are the test's to set. */
export async function makeCounterWorld(db: Db, overrides: { currency?: string } = {}): Promise<CounterWorld> {
  const store = await makeStore(db, { currency: overrides.currency ?? 'USD' });
  const clerkRow = await makeUser(db, { role: 'clerk', storeId: store.id, name: 'Test Clerk' });
  const managerRow = await makeUser(db, { role: 'manager', storeId: store.id, name: 'Test Manager' });
  const seller = await makeSeller(db, store.id);
  return {
    storeId: store.id,
    storeCode: store.code,
    clerk: (await loadActiveUser(db, clerkRow.id))!,
    manager: (await loadActiveUser(db, managerRow.id))!,
    sellerId: seller.id,
  };
}

export async function setSpots(db: Db, world: CounterWorld, spots: Partial<Record<Metal, string>>) {
  for (const [metal, price] of Object.entries(spots)) {
    await enterSpot(db, world.manager, world.storeId, { metal: metal as Metal, pricePerTroyOunce: price! }, repriceOpenTickets);
  }
}

/** A spot entered some minutes ago, to test staleness without waiting. */
export async function setOldSpot(db: Db, world: CounterWorld, metal: Metal, price: string, minutesAgo: number) {
  await db.insert(spotPrices).values({
    storeId: world.storeId,
    metal,
    pricePerTroyOunce: price,
    currency: 'USD',
    enteredBy: world.manager.id,
    enteredAt: new Date(Date.now() - minutesAgo * 60_000),
  });
}

export async function setSetting(db: Db, world: CounterWorld, key: string, value: unknown) {
  await setStoreSetting(db, world.manager, world.storeId, key, value);
}

export const SIGNATURE = '<svg xmlns="http://www.w3.org/2000/svg" viewBox="0 0 100 40"><path d="M5 30 C 20 5, 40 5, 60 30 S 90 40, 95 10" stroke="black" fill="none"/></svg>';

/** Lines of the demo flow: sterling flatware with a deduction, a 14K ring with a stone, ten 90% dimes. */
export const FLOW_LINES = [
  {
    item: {
      kind: 'weight',
      category: 'flatware',
      mark: 'STERLING',
      grossWeight: { value: '412.6', unit: 'g' },
      deductions: [{ kind: 'grams', value: '96.0', reason: 'hollow knife handles: steel blades and filler' }],
      description: 'Sterling flatware, 6 pieces',
    },
    testMethod: 'acid',
    testResult: 'holds at 925 acid',
  },
  {
    item: {
      kind: 'weight',
      category: 'jewelry',
      mark: '14K',
      grossWeight: { value: '5.42', unit: 'g' },
      deductions: [{ kind: 'grams', value: '0.31', reason: 'centre stone' }],
      description: '14K ring with stone',
    },
    testMethod: 'electronic',
    testResult: 'reads 14K',
  },
  { item: { kind: 'coin', coinType: 'us-90-dime', count: 10 }, testMethod: 'none' },
] as const;
