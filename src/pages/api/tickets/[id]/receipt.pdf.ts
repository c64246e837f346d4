import type { APIRoute } from 'astro';
import { getDb } from '@/db/client';
import { getTicket } from '@/features/counter/tickets.server';
import { buildReceipt, receiptUnavailableReason } from '@/features/receipts/receipt';
import { renderReceiptPdf } from '@/features/receipts/receipt-pdf.server';
import { requireRole } from '@/lib/auth-guard';
import { AppError } from '@/lib/errors';
import { handle } from '@/lib/http';

export const GET: APIRoute = handle(async ({ locals, params }) => {
  const user = requireRole(locals, 'staff');
  const ticket = await getTicket(getDb(), user, params.id!);
  const unavailable = receiptUnavailableReason(ticket);
  if (unavailable) throw new AppError(409, unavailable);
  const pdf = await renderReceiptPdf(buildReceipt(ticket));
  return new Response(pdf as Uint8Array<ArrayBuffer>, {
    status: 200,
    headers: {
      'content-type': 'application/pdf',
      'content-disposition': `attachment; filename="receipt-${ticket.reference}.pdf"`,
      'content-length': String(pdf.byteLength),
      'cache-control': 'no-store',
    },
  });
});
