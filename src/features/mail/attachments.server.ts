import type { DbOrTx } from '@/db/client';
import { getTicketUnscoped } from '@/features/counter/tickets.server';
import { buildReceipt } from '@/features/receipts/receipt';
import { renderReceiptPdf } from '@/features/receipts/receipt-pdf.server';
import type { AttachmentRenderer } from './outbox.server';

/** The receipt PDF for an outgoing e-mail, rendered from the ticket as it stands when the mail goes out. */
export function receiptAttachments(db: DbOrTx): AttachmentRenderer {
  return async (ticketId) => {
    const model = buildReceipt(await getTicketUnscoped(db, ticketId));
    return { filename: `receipt-${model.reference}.pdf`, content: Buffer.from(await renderReceiptPdf(model)), contentType: 'application/pdf' };
  };
}
