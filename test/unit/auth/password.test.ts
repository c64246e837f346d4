import { describe, expect, it } from 'vitest';
import { BCRYPT_COST, bcryptCostOf, hashPassword, passwordSchema, PASSWORD_MIN_LENGTH, verifyPassword } from '@/features/auth/password';

describe('passwords', () => {
  it('hashes with bcrypt at cost 12 or more and verifies', async () => {
    const hash = await hashPassword('a-long-enough-password');
    expect(hash).toMatch(/^\$2[aby]\$\d\d\$.{53}$/);
    expect(bcryptCostOf(hash)).toBe(BCRYPT_COST);
    expect(BCRYPT_COST).toBeGreaterThanOrEqual(12);
    expect(await verifyPassword('a-long-enough-password', hash)).toBe(true);
    expect(await verifyPassword('a-long-enough-passworD', hash)).toBe(false);
  });

  it('never verifies against a missing hash', async () => {
    expect(await verifyPassword('anything-at-all', null)).toBe(false);
  });

  it(`requires at least ${PASSWORD_MIN_LENGTH} characters and at most 72 bytes`, () => {
    expect(passwordSchema.safeParse('x'.repeat(PASSWORD_MIN_LENGTH - 1)).success).toBe(false);
    expect(passwordSchema.safeParse('x'.repeat(PASSWORD_MIN_LENGTH)).success).toBe(true);
    expect(passwordSchema.safeParse('é'.repeat(37)).success).toBe(false);
  });
});
