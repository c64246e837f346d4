import type { APIRoute } from 'astro';
import { getDb } from '@/db/client';
import { sellerAtCounter } from '@/features/sellers/sellers.server';
import { requireRole, storeScope } from '@/lib/auth-guard';
import { handle, json } from '@/lib/http';

/** A seller with today's checks against the store's rules, and their recent tickets. */
export const GET: APIRoute = handle(async ({ locals, url, params }) => {
  const user = requireRole(locals, 'staff');
  const storeId = storeScope(user, url.searchParams.get('storeId'));
  return json(await sellerAtCounter(getDb(), storeId, params.id!));
});
