import type { APIRoute } from 'astro';
import { getDb } from '@/db/client';
import { acceptTicketSchema, declineTicketSchema, payTicketSchema, voidTicketSchema } from '@/features/counter/counter.schema';
import { acceptTicket, declineTicket, getTicket, payTicket, quoteTicket, voidTicket } from '@/features/counter/tickets.server';
import { payElectronically } from '@/features/settlement/settlement.server';
import { requireRole } from '@/lib/auth-guard';
import { AppError } from '@/lib/errors';
import { handle, json, parseJsonBody } from '@/lib/http';

/** The ticket's state changes: quote, accept, decline, pay, void. The service enforces their order (409). */
export const POST: APIRoute = handle(async ({ locals, params, request }) => {
  const id = params.id!;
  const db = getDb();
  switch (params.action) {
    case 'quote':
      return json({ ticket: await quoteTicket(db, requireRole(locals, 'staff'), id) });
    case 'accept': {
      const user = requireRole(locals, 'staff');
      const input = await parseJsonBody(request, acceptTicketSchema);
      return json({ ticket: await acceptTicket(db, user, id, input) });
    }
    case 'decline': {
      const user = requireRole(locals, 'staff');
      const input = await parseJsonBody(request, declineTicketSchema);
      return json({ ticket: await declineTicket(db, user, id, input.reason) });
    }
    case 'pay': {
      const user = requireRole(locals, 'staff');
      const input = await parseJsonBody(request, payTicketSchema);
      if (input.method === 'electronic') {
        const payment = await payElectronically(db, user, id, { speed: input.speed });
        return json({ payment, ticket: await getTicket(db, user, id) }, payment?.state === 'pending' ? 202 : 200);
      }
      return json({ ticket: await payTicket(db, user, id, input) });
    }
    case 'void': {
      const user = requireRole(locals, 'managers');
      const input = await parseJsonBody(request, voidTicketSchema);
      return json({ ticket: await voidTicket(db, user, id, input.reason) });
    }
    default:
      throw new AppError(404, 'No such ticket action');
  }
});
