import type { APIRoute } from 'astro';
import { getDb } from '@/db/client';
import { handleWebhook } from '@/features/settlement/settlement.server';
import { handle, json } from '@/lib/http';

/** The payment provider's webhook: verified by signature, applied once per event id. */
export const POST: APIRoute = handle(async ({ request }) => {
  const raw = await request.text();
  const result = await handleWebhook(getDb(), raw, request.headers.get('stripe-signature'));
  return json({ received: true, ...result });
});
