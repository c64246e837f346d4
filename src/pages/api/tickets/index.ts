import type { APIRoute } from 'astro';
import { getDb } from '@/db/client';
import { createTicketSchema } from '@/features/counter/counter.schema';
import { createTicket, listTickets } from '@/features/counter/tickets.server';
import { requireRole, storeScope } from '@/lib/auth-guard';
import { handle, json, parseJsonBody } from '@/lib/http';

export const GET: APIRoute = handle(async ({ locals, url }) => {
  const user = requireRole(locals, 'staff');
  const storeId = storeScope(user, url.searchParams.get('storeId'));
  return json({ tickets: await listTickets(getDb(), storeId, { sellerId: url.searchParams.get('sellerId') ?? undefined }) });
});

export const POST: APIRoute = handle(async ({ locals, url, request }) => {
  const user = requireRole(locals, 'staff');
  const storeId = storeScope(user, url.searchParams.get('storeId'));
  const input = await parseJsonBody(request, createTicketSchema);
  return json({ ticket: await createTicket(getDb(), user, storeId, input) }, 201);
});
