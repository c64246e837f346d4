import { AppError } from '@/lib/errors';

/** Runs a page's load; a record that is not there (or not the user's) gives null, so the page can show its 404. */
export async function orNotFound<T>(load: () => Promise<T>): Promise<T | null> {
  try {
    return await load();
  } catch (err) {
    if (err instanceof AppError && err.status === 404) return null;
    throw err;
  }
}
