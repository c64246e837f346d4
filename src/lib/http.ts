import type { ZodType, ZodTypeDef } from 'zod';
import { AppError, fromDatabaseError, validationError } from './errors';

export function json(body: unknown, status = 200, headers: Record<string, string> = {}): Response {
  return new Response(JSON.stringify(body), {
    status,
    headers: { 'content-type': 'application/json; charset=utf-8', 'cache-control': 'no-store', ...headers },
  });
}

export function errorResponse(err: unknown): Response {
  const appError = err instanceof AppError ? err : fromDatabaseError(err);
  if (appError) return json({ error: appError.message, issues: appError.issues }, appError.status);
  console.error(err);
  return json({ error: 'Something went wrong on the server. Nothing was saved.' }, 500);
}

/** Reads a JSON body and validates it; a body that is not JSON is a 400 naming the body. */
export async function parseJsonBody<T>(request: Request, schema: ZodType<T, ZodTypeDef, unknown>): Promise<T> {
  let raw: unknown;
  try {
    raw = await request.json();
  } catch {
    throw new AppError(400, 'The request body must be JSON', [{ path: '(body)', message: 'not valid JSON' }]);
  }
  const result = schema.safeParse(raw);
  if (!result.success) throw validationError(result.error);
  return result.data;
}

/** Wraps an endpoint so thrown AppErrors and constraint violations become JSON answers. */
export function handle<C>(fn: (context: C) => Promise<Response>): (context: C) => Promise<Response> {
  return async (context) => {
    try {
      return await fn(context);
    } catch (err) {
      return errorResponse(err);
    }
  };
}
