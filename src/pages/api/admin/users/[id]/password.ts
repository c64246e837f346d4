import type { APIRoute } from 'astro';
import { getDb } from '@/db/client';
import { resetPasswordSchema } from '@/features/auth/auth.schema';
import { resetPassword } from '@/features/auth/users.server';
import { requireRole } from '@/lib/auth-guard';
import { handle, json, parseJsonBody } from '@/lib/http';

export const POST: APIRoute = handle(async ({ locals, request, params }) => {
  const actor = requireRole(locals, 'admins');
  const { password } = await parseJsonBody(request, resetPasswordSchema);
  await resetPassword(getDb(), actor, params.id!, password);
  return json({ ok: true });
});
