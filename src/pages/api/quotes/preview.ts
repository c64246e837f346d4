import type { APIRoute } from 'astro';
import { getDb } from '@/db/client';
import { previewQuote } from '@/features/counter/preview.server';
import { requireRole } from '@/lib/auth-guard';
import { AppError } from '@/lib/errors';
import { handle, json } from '@/lib/http';

/** Prices a quote without saving anything. Stable: other parts of Cupel and outside checks call it. */
export const POST: APIRoute = handle(async ({ locals, request }) => {
  const user = requireRole(locals, 'staff');
  let body: unknown;
  try {
    body = await request.json();
  } catch {
    throw new AppError(400, 'The request body must be JSON', [{ path: '(body)', message: 'not valid JSON' }]);
  }
  if (typeof body !== 'object' || body === null || Array.isArray(body)) {
    throw new AppError(422, 'The request body must be a JSON object with spot and lines', [{ path: '(body)', message: 'must be an object' }]);
  }
  const result = await previewQuote(getDb(), user, body as Record<string, unknown>);
  if (!result.ok) {
    throw new AppError(422, `Invalid quote: ${result.issues.map((i) => `${i.path || '(root)'}: ${i.message}`).join('; ')}`, [...result.issues]);
  }
  return json(result.quote);
});
