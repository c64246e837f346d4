import type { APIRoute } from 'astro';
import { getDb } from '@/db/client';
import { updateUserSchema } from '@/features/auth/auth.schema';
import { updateUser } from '@/features/auth/users.server';
import { requireRole } from '@/lib/auth-guard';
import { handle, json, parseJsonBody } from '@/lib/http';

export const PATCH: APIRoute = handle(async ({ locals, request, params }) => {
  const actor = requireRole(locals, 'admins');
  const change = await parseJsonBody(request, updateUserSchema);
  await updateUser(getDb(), actor, params.id!, change);
  return json({ ok: true });
});
