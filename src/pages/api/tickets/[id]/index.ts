import type { APIRoute } from 'astro';
import { getDb } from '@/db/client';
import { getTicket } from '@/features/counter/tickets.server';
import { requireRole } from '@/lib/auth-guard';
import { handle, json } from '@/lib/http';

export const GET: APIRoute = handle(async ({ locals, params }) => {
  const user = requireRole(locals, 'staff');
  return json({ ticket: await getTicket(getDb(), user, params.id!) });
});
