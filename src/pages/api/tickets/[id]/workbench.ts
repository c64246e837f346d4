import type { APIRoute } from 'astro';
import { getDb } from '@/db/client';
import { workbenchData } from '@/features/counter/workbench.server';
import { requireRole } from '@/lib/auth-guard';
import { handle, json } from '@/lib/http';

/** The ticket screen's data: the ticket, its seller's checks, the spot board and the clerk's drawer. */
export const GET: APIRoute = handle(async ({ locals, params }) => {
  const user = requireRole(locals, 'staff');
  return json(await workbenchData(getDb(), user, params.id!));
});
