import type { Db } from '@/db/client';
import { saveLinesSchema } from '@/features/counter/counter.schema';
import { acceptTicket, createTicket, quoteTicket, saveLines } from '@/features/counter/tickets.server';
import { FLOW_LINES, SIGNATURE, type CounterWorld } from './counter';

/** A ticket of the demo flow's three lines, quoted and accepted by the seller: ready to be paid. */
export async function acceptedTicket(db: Db, world: CounterWorld, lines: unknown[] = [...FLOW_LINES]) {
  const t = await createTicket(db, world.clerk, world.storeId, { sellerId: world.sellerId, doNotBuyOverrideReason: null });
  await saveLines(db, world.clerk, t.id, saveLinesSchema.parse({ lines }));
  await quoteTicket(db, world.clerk, t.id);
  await acceptTicket(db, world.clerk, t.id, { signatureSvg: SIGNATURE });
  return t;
}
