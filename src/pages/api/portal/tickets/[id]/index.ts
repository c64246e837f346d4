import type { APIRoute } from 'astro';
import { getDb } from '@/db/client';
import { portalReceipt } from '@/features/portal/portal.server';
import { requireRole } from '@/lib/auth-guard';
import { handle, json } from '@/lib/http';

export const GET: APIRoute = handle(async ({ locals, params }) => json({ receipt: await portalReceipt(getDb(), requireRole(locals, 'sellers'), params.id!) }));
