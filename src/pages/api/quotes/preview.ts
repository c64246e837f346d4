import type { APIRoute } from 'astro';
import { eq } from 'drizzle-orm';
import { getDb } from '@/db/client';
import { stores } from '@/db/schema';
import { safePriceQuote } from '@/features/pricing/pricing';
import { getStoreSettings } from '@/features/settings/settings.server';
import { requireRole } from '@/lib/auth-guard';
import { AppError } from '@/lib/errors';
import { handle, json } from '@/lib/http';

/**
 * Prices a quote without saving anything. Rates, paid-on finenesses and currency not given in the
 * body come from the signed-in user's store. Stable: other parts of Cupel and outside checks call it.
 */
export const POST: APIRoute = handle(async ({ locals, request }) => {
  const user = requireRole(locals, 'staff');
  let body: unknown;
  try {
    body = await request.json();
  } catch {
    throw new AppError(400, 'The request body must be JSON', [{ path: '(body)', message: 'not valid JSON' }]);
  }
  if (typeof body !== 'object' || body === null || Array.isArray(body)) {
    throw new AppError(422, 'The request body must be a JSON object with spot and lines', [{ path: '(body)', message: 'must be an object' }]);
  }
  const input = { ...(body as Record<string, unknown>) };
  if (user.storeId && (input.rates === undefined || input.assumedFineness === undefined || input.currency === undefined)) {
    const db = getDb();
    const settings = await getStoreSettings(db, user.storeId);
    input.rates ??= settings['pricing.rates'];
    input.assumedFineness ??= settings['pricing.assumed_fineness'];
    if (input.currency === undefined) {
      const [store] = await db.select({ currency: stores.currency }).from(stores).where(eq(stores.id, user.storeId));
      input.currency = store?.currency;
    }
  }
  const result = safePriceQuote(input);
  if (!result.ok) {
    return json({ error: `Invalid quote: ${result.issues.map((i) => `${i.path || '(root)'}: ${i.message}`).join('; ')}`, issues: result.issues }, 422);
  }
  return json(result.quote);
});
