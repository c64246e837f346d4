import type { APIRoute } from 'astro';
import { getDb } from '@/db/client';
import { settleExceptionSchema } from '@/features/payouts/payouts.schema';
import { settlePaymentException } from '@/features/payouts/reversals.server';
import { requireRole } from '@/lib/auth-guard';
import { handle, json, parseJsonBody } from '@/lib/http';

/** A manager settles a payout exception (take the money back, record it came back, or close it with a note). */
export const POST: APIRoute = handle(async ({ locals, params, request }) => {
  const user = requireRole(locals, 'managers');
  const input = await parseJsonBody(request, settleExceptionSchema);
  return json(await settlePaymentException(getDb(), user, params.id!, input));
});
