import type { APIRoute } from 'astro';
import { getDb } from '@/db/client';
import { sellerInputSchema } from '@/features/counter/counter.schema';
import { createSeller, searchSellers } from '@/features/sellers/sellers.server';
import { requireRole, storeScope } from '@/lib/auth-guard';
import { handle, json, parseJsonBody } from '@/lib/http';

export const GET: APIRoute = handle(async ({ locals, url }) => {
  const user = requireRole(locals, 'staff');
  const storeId = storeScope(user, url.searchParams.get('storeId'));
  return json({ sellers: await searchSellers(getDb(), storeId, url.searchParams.get('q') ?? '') });
});

export const POST: APIRoute = handle(async ({ locals, url, request }) => {
  const user = requireRole(locals, 'staff');
  const storeId = storeScope(user, url.searchParams.get('storeId'));
  const input = await parseJsonBody(request, sellerInputSchema);
  return json({ seller: await createSeller(getDb(), user, storeId, input) }, 201);
});
