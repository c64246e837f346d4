import type { APIRoute } from 'astro';
import { handle, json } from '@/lib/http';
import { requireRole } from '@/lib/auth-guard';

/** Who is signed in, for any role. */
export const GET: APIRoute = handle(async ({ locals }) => json({ user: requireRole(locals, 'signedIn') }));
