import type { APIRoute } from 'astro';
import { getDb } from '@/db/client';
import { pendingApprovals } from '@/features/counter/tickets.server';
import { requireRole, storeScope } from '@/lib/auth-guard';
import { handle, json } from '@/lib/http';

/** The queue of rate raises waiting for a manager. */
export const GET: APIRoute = handle(async ({ locals, url }) => {
  const user = requireRole(locals, 'managers');
  const storeId = storeScope(user, url.searchParams.get('storeId'));
  return json({ approvals: await pendingApprovals(getDb(), storeId) });
});
