import type { APIRoute } from 'astro';
import { getDb } from '@/db/client';
import { openDrawerSchema } from '@/features/counter/counter.schema';
import { drawerExpectedMinor, drawersOfStore, openDrawer, openDrawerFor } from '@/features/counter/tickets.server';
import { requireRole, storeScope } from '@/lib/auth-guard';
import { handle, json, parseJsonBody } from '@/lib/http';

/** The signed-in clerk's open drawer, and for managers the store's recent drawers. */
export const GET: APIRoute = handle(async ({ locals, url }) => {
  const user = requireRole(locals, 'staff');
  const storeId = storeScope(user, url.searchParams.get('storeId'));
  const db = getDb();
  const mine = await openDrawerFor(db, user.id);
  const store = user.role === 'clerk' ? undefined : await drawersOfStore(db, storeId);
  return json({ mine: mine ? { ...mine, balanceMinor: await drawerExpectedMinor(db, mine.id, mine.floatMinor) } : null, store });
});

export const POST: APIRoute = handle(async ({ locals, url, request }) => {
  const user = requireRole(locals, 'staff');
  const storeId = storeScope(user, url.searchParams.get('storeId'));
  const input = await parseJsonBody(request, openDrawerSchema);
  return json({ drawer: await openDrawer(getDb(), user, storeId, input.float) }, 201);
});
