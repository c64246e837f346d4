import type { APIRoute } from 'astro';
import { z } from 'zod';
import { getDb } from '@/db/client';
import { contactUpdateSchema } from '@/features/portal/portal.schema';
import { portalContact, updatePortalContact } from '@/features/portal/portal.server';
import { requireRole } from '@/lib/auth-guard';
import { handle, json, parseJsonBody } from '@/lib/http';

export const GET: APIRoute = handle(async ({ locals }) => json({ records: await portalContact(getDb(), requireRole(locals, 'sellers')) }));

export const PUT: APIRoute = handle(async ({ locals, request }) => {
  const user = requireRole(locals, 'sellers');
  const body = await parseJsonBody(request, z.object({ sellerId: z.string().min(1, 'sellerId is required'), contact: contactUpdateSchema }));
  await updatePortalContact(getDb(), user, body.sellerId, body.contact);
  return json({ records: await portalContact(getDb(), user) });
});
