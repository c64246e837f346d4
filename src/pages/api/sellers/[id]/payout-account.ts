import type { APIRoute } from 'astro';
import QRCode from 'qrcode';
import { getDb } from '@/db/client';
import { refreshPayoutAccount, startOnboarding } from '@/features/settlement/settlement.server';
import { sellerAtCounter } from '@/features/sellers/sellers.server';
import { requireRole, storeScope } from '@/lib/auth-guard';
import { handle, json } from '@/lib/http';

/** The seller's payout account as the provider last reported it. */
export const GET: APIRoute = handle(async ({ locals, params, url }) => {
  const user = requireRole(locals, 'staff');
  const storeId = storeScope(user, url.searchParams.get('storeId'));
  await sellerAtCounter(getDb(), storeId, params.id!);
  return json({ payoutAccount: await refreshPayoutAccount(getDb(), params.id!) });
});

/** Sends the seller an onboarding link (and returns it with a QR code for the seller-facing screen). */
export const POST: APIRoute = handle(async ({ locals, params, url }) => {
  const user = requireRole(locals, 'staff');
  const storeId = storeScope(user, url.searchParams.get('storeId'));
  await sellerAtCounter(getDb(), storeId, params.id!);
  const result = await startOnboarding(getDb(), user, params.id!);
  const qrSvg = await QRCode.toString(result.url, { type: 'svg', margin: 1, width: 240 });
  return json({ url: result.url, emailed: result.emailed, qrSvg }, 201);
});
