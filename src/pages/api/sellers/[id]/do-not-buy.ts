import type { APIRoute } from 'astro';
import { getDb } from '@/db/client';
import { doNotBuySchema } from '@/features/counter/counter.schema';
import { setDoNotBuy } from '@/features/sellers/sellers.server';
import { requireRole, storeScope } from '@/lib/auth-guard';
import { handle, json, parseJsonBody } from '@/lib/http';

export const PUT: APIRoute = handle(async ({ locals, url, params, request }) => {
  const user = requireRole(locals, 'managers');
  const storeId = storeScope(user, url.searchParams.get('storeId'));
  const input = await parseJsonBody(request, doNotBuySchema);
  await setDoNotBuy(getDb(), user, storeId, params.id!, input.doNotBuy, input.reason);
  return json({ ok: true });
});
