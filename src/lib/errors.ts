import type { ZodError } from 'zod';

export interface FieldIssue {
  path: string;
  message: string;
}

/** An error a service raises on purpose; endpoints turn it into a JSON answer with its status. */
export class AppError extends Error {
  constructor(
    readonly status: 400 | 401 | 403 | 404 | 409 | 422 | 429,
    message: string,
    readonly issues: FieldIssue[] = [],
  ) {
    super(message);
  }
}

export function issuesFromZod(error: ZodError): FieldIssue[] {
  return error.issues.map((i) => ({ path: i.path.join('.') || '(body)', message: i.message }));
}

export function validationError(error: ZodError): AppError {
  const issues = issuesFromZod(error);
  const summary = issues.map((i) => `${i.path}: ${i.message}`).join('; ');
  return new AppError(422, `Invalid input: ${summary}`, issues);
}

/** Maps a PostgreSQL constraint violation to a clear 409/422 rather than a 500. */
export function fromDatabaseError(err: unknown): AppError | undefined {
  const e = err as { code?: string; constraint_name?: string; constraint?: string; cause?: unknown };
  const source = (e?.code ? e : (e?.cause as typeof e)) ?? {};
  const constraint = source.constraint_name ?? source.constraint ?? 'constraint';
  switch (source.code) {
    case '23505':
      return new AppError(409, `Already exists (${constraint})`, [{ path: constraint, message: 'must be unique' }]);
    case '23514':
    case '23502':
    case '22P02':
    case '22007':
    case '22008':
      return new AppError(422, `Invalid value (${constraint})`, [{ path: constraint, message: 'refused by the database' }]);
    case '23503':
      return new AppError(422, `Refers to a missing record (${constraint})`, [{ path: constraint, message: 'unknown reference' }]);
    // Raised by the triggers that keep accepted, paid and voided tickets as they were (migration 0006).
    case '23R01':
      return new AppError(409, `This record is on file and cannot be changed (${constraint})`, [{ path: constraint, message: 'on the record' }]);
    case '23R02':
      return new AppError(409, `A change to a record on file must be audited (${constraint})`, [{ path: constraint, message: 'not audited' }]);
    default:
      return undefined;
  }
}
