import type { DbOrTx } from '@/db/client';
import type { SessionUser } from '@/features/auth/users.server';
import { safePriceQuote, type QuoteResult } from '@/features/pricing/pricing';
import { getStoreSettings } from '@/features/settings/settings.server';
import { storeById } from '@/features/stores/stores.server';

/**
 * A quote priced for the caller's store without saving anything: rates, paid-on finenesses and
 * currency the body leaves out come from the store's settings.
 */
export async function previewQuote(db: DbOrTx, user: SessionUser, body: Record<string, unknown>): Promise<QuoteResult> {
  const input = { ...body };
  if (user.storeId && (input.rates === undefined || input.assumedFineness === undefined || input.currency === undefined)) {
    const settings = await getStoreSettings(db, user.storeId);
    input.rates ??= settings['pricing.rates'];
    input.assumedFineness ??= settings['pricing.assumed_fineness'];
    if (input.currency === undefined) input.currency = (await storeById(db, user.storeId))?.currency;
  }
  return safePriceQuote(input);
}
