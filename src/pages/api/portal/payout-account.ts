import type { APIRoute } from 'astro';
import { z } from 'zod';
import { getDb } from '@/db/client';
import { portalPayoutAccounts, portalStartOnboarding } from '@/features/portal/portal.server';
import { requireRole } from '@/lib/auth-guard';
import { handle, json, parseJsonBody } from '@/lib/http';

export const GET: APIRoute = handle(async ({ locals }) => json({ accounts: await portalPayoutAccounts(getDb(), requireRole(locals, 'sellers')) }));

/** Starts (or resumes) onboarding: answers with the provider's link to open. */
export const POST: APIRoute = handle(async ({ locals, request }) => {
  const user = requireRole(locals, 'sellers');
  const { sellerId } = await parseJsonBody(request, z.object({ sellerId: z.string().min(1, 'sellerId is required') }));
  const result = await portalStartOnboarding(getDb(), user, sellerId);
  return json({ url: result.url }, 201);
});
