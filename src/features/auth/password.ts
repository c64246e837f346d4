import bcrypt from 'bcryptjs';
import { z } from 'zod';

/** bcrypt cost; 12 is the floor this product accepts (each step doubles the work). */
export const BCRYPT_COST = 12;
export const PASSWORD_MIN_LENGTH = 12;
/** bcrypt reads only the first 72 bytes of a password; longer ones are refused rather than silently cut. */
export const PASSWORD_MAX_BYTES = 72;

export const passwordSchema = z
  .string({ required_error: 'password is required' })
  .min(PASSWORD_MIN_LENGTH, `password must be at least ${PASSWORD_MIN_LENGTH} characters`)
  .refine((p) => new TextEncoder().encode(p).length <= PASSWORD_MAX_BYTES, `password must be at most ${PASSWORD_MAX_BYTES} bytes`);

export function hashPassword(plain: string): Promise<string> {
  return bcrypt.hash(plain, BCRYPT_COST);
}

export function verifyPassword(plain: string, hash: string | null | undefined): Promise<boolean> {
  // Compare against a fixed hash when the account has none, so timing does not tell whether it exists.
  return bcrypt.compare(plain, hash ?? DUMMY_HASH);
}

export function bcryptCostOf(hash: string): number {
  return Number(hash.split('$')[2]);
}

const DUMMY_HASH = '$2b$12$ucIAMZICCquQOR7GVioWz.jeRb8AIcFM/76Y9y1IUKEo0De7bkSu2';
