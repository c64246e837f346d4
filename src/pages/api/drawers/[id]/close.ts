import type { APIRoute } from 'astro';
import { getDb } from '@/db/client';
import { closeDrawerSchema } from '@/features/counter/counter.schema';
import { closeDrawer } from '@/features/counter/tickets.server';
import { requireRole } from '@/lib/auth-guard';
import { handle, json, parseJsonBody } from '@/lib/http';

export const POST: APIRoute = handle(async ({ locals, params, request }) => {
  const user = requireRole(locals, 'managers');
  const input = await parseJsonBody(request, closeDrawerSchema);
  return json(await closeDrawer(getDb(), user, params.id!, input.counted));
});
