import type { APIRoute } from 'astro';
import { getDb } from '@/db/client';
import { decideApprovalSchema } from '@/features/counter/counter.schema';
import { decideApproval } from '@/features/counter/tickets.server';
import { requireRole } from '@/lib/auth-guard';
import { handle, json, parseJsonBody } from '@/lib/http';

/** A manager approves or rejects a raise; on a clerk's screen the manager gives their own e-mail and password. */
export const POST: APIRoute = handle(async ({ locals, params, request, clientAddress }) => {
  const user = requireRole(locals, 'staff');
  const input = await parseJsonBody(request, decideApprovalSchema);
  return json({ approval: await decideApproval(getDb(), user, params.id!, input, clientAddress) });
});
