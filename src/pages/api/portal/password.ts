import type { APIRoute } from 'astro';
import { getDb } from '@/db/client';
import { portalPasswordSchema } from '@/features/portal/portal.schema';
import { setPortalPassword } from '@/features/portal/portal.server';
import { requireRole } from '@/lib/auth-guard';
import { handle, json, parseJsonBody } from '@/lib/http';

/** A signed-in seller sets a password, to sign in without an e-mail link next time. */
export const POST: APIRoute = handle(async ({ locals, request }) => {
  const user = requireRole(locals, 'sellers');
  const { password } = await parseJsonBody(request, portalPasswordSchema);
  await setPortalPassword(getDb(), user, password);
  return json({ ok: true });
});
