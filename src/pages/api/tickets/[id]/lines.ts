import type { APIRoute } from 'astro';
import { getDb } from '@/db/client';
import { saveLinesSchema } from '@/features/counter/counter.schema';
import { getTicket, saveLines } from '@/features/counter/tickets.server';
import { requireRole } from '@/lib/auth-guard';
import { handle, json, parseJsonBody } from '@/lib/http';

/** Replaces the ticket's graded lines; the server prices them again and never trusts a client total. */
export const PUT: APIRoute = handle(async ({ locals, params, request }) => {
  const user = requireRole(locals, 'staff');
  const input = await parseJsonBody(request, saveLinesSchema);
  const db = getDb();
  const saved = await saveLines(db, user, params.id!, input);
  return json({ ...saved, ticket: await getTicket(db, user, params.id!) });
});
