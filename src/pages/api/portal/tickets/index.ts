import type { APIRoute } from 'astro';
import { getDb } from '@/db/client';
import { listSettlements } from '@/features/portal/portal.server';
import { requireRole } from '@/lib/auth-guard';
import { handle, json } from '@/lib/http';

export const GET: APIRoute = handle(async ({ locals }) => json({ settlements: await listSettlements(getDb(), requireRole(locals, 'sellers')) }));
