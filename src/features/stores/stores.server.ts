import { eq } from 'drizzle-orm';
import { stores } from '@/db/schema';
import type { DbOrTx } from '@/db/client';

export async function storeById(db: DbOrTx, storeId: string) {
  const [store] = await db.select().from(stores).where(eq(stores.id, storeId));
  return store ?? null;
}
