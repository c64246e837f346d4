import type { APIRoute } from 'astro';
import { getDb } from '@/db/client';
import { reversalActionSchema } from '@/features/payouts/payouts.schema';
import { recordManualRecovery, retryReversal } from '@/features/payouts/reversals.server';
import { requireRole } from '@/lib/auth-guard';
import { AppError } from '@/lib/errors';
import { handle, json, parseJsonBody } from '@/lib/http';

/** A pending reversal: a manager records the money recovered another way, or asks the provider again. */
export const POST: APIRoute = handle(async ({ locals, params, request }) => {
  const user = requireRole(locals, 'managers');
  const input = await parseJsonBody(request, reversalActionSchema);
  if (input.action === 'retry') return json(await retryReversal(getDb(), user, params.id!));
  if (input.note.length < 1) throw new AppError(422, 'note is required: say how the money came back', [{ path: 'note', message: 'note is required' }]);
  return json(await recordManualRecovery(getDb(), user, params.id!, input.note));
});
