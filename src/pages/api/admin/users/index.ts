import type { APIRoute } from 'astro';
import { getDb } from '@/db/client';
import { createStaffUserSchema } from '@/features/auth/auth.schema';
import { createStaffUser, listUsers } from '@/features/auth/users.server';
import { requireRole } from '@/lib/auth-guard';
import { handle, json, parseJsonBody } from '@/lib/http';

export const GET: APIRoute = handle(async ({ locals }) => {
  requireRole(locals, 'admins');
  return json({ users: await listUsers(getDb()) });
});

export const POST: APIRoute = handle(async ({ locals, request }) => {
  const actor = requireRole(locals, 'admins');
  const input = await parseJsonBody(request, createStaffUserSchema);
  return json({ user: await createStaffUser(getDb(), actor, input) }, 201);
});
