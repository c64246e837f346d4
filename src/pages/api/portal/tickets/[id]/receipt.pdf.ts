import type { APIRoute } from 'astro';
import { getDb } from '@/db/client';
import { portalReceipt } from '@/features/portal/portal.server';
import { renderReceiptPdf } from '@/features/receipts/receipt-pdf.server';
import { requireRole } from '@/lib/auth-guard';
import { handle } from '@/lib/http';

export const GET: APIRoute = handle(async ({ locals, params }) => {
  const model = await portalReceipt(getDb(), requireRole(locals, 'sellers'), params.id!);
  const pdf = await renderReceiptPdf(model);
  return new Response(Buffer.from(pdf), {
    headers: { 'content-type': 'application/pdf', 'content-disposition': `attachment; filename="receipt-${model.reference}.pdf"`, 'cache-control': 'private, no-store' },
  });
});
