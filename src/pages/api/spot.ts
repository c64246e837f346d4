import type { APIRoute } from 'astro';
import { getDb } from '@/db/client';
import { spotEntrySchema } from '@/features/counter/counter.schema';
import { enterSpot, spotBoard, spotHistory } from '@/features/counter/spot.server';
import { repriceOpenTickets } from '@/features/counter/tickets.server';
import { requireRole, storeScope } from '@/lib/auth-guard';
import { handle, json, parseJsonBody } from '@/lib/http';

/** The spot board (newest per metal, with staleness) and the entry history. */
export const GET: APIRoute = handle(async ({ locals, url }) => {
  const user = requireRole(locals, 'staff');
  const storeId = storeScope(user, url.searchParams.get('storeId'));
  const db = getDb();
  const [board, history] = await Promise.all([spotBoard(db, storeId), spotHistory(db, storeId)]);
  return json({ ...board, history });
});

export const POST: APIRoute = handle(async ({ locals, url, request }) => {
  const user = requireRole(locals, 'staff');
  const storeId = storeScope(user, url.searchParams.get('storeId'));
  const input = await parseJsonBody(request, spotEntrySchema);
  const result = await enterSpot(getDb(), user, storeId, input, repriceOpenTickets);
  return json(result, 201);
});
