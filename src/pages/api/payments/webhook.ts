import type { APIRoute } from 'astro';
import { getDb } from '@/db/client';
import { handleWebhook } from '@/features/payouts/inbox.server';
import { handle, json } from '@/lib/http';

/** The payment provider's webhook: verified by signature, stored in the inbox once per event id, then applied (or by the worker). */
export const POST: APIRoute = handle(async ({ request }) => {
  const raw = await request.text();
  const result = await handleWebhook(getDb(), raw, request.headers.get('stripe-signature'));
  return json({ received: true, ...result });
});
