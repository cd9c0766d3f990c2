import { performance } from 'node:perf_hooks';
import { describe, expect, it } from 'vitest';
import { burnPasswordCheck, generateTemporaryPassword, hashPassword, verifyPassword } from './password-hash';

describe('password hashing', () => {
  it('verifies the right password and refuses a wrong one', async () => {
    const stored = await hashPassword('film-base-and-leader');
    expect(stored).toMatch(/^scrypt\$16384\$8\$1\$[A-Za-z0-9_-]{22}\$[A-Za-z0-9_-]{43}$/);
    expect(await verifyPassword('film-base-and-leader', stored)).toBe(true);
    expect(await verifyPassword('film-base-and-leadeR', stored)).toBe(false);
  });

  it('salts every hash, so one password hashes two ways', async () => {
    expect(await hashPassword('same-password')).not.toBe(await hashPassword('same-password'));
  });

  it('never matches a malformed stored hash', async () => {
    expect(await verifyPassword('x', 'plain-text')).toBe(false);
    expect(await verifyPassword('x', 'scrypt$16384$8$1$c2FsdA$')).toBe(false);
  });

  it('spends about as long on an unknown e-mail as on a wrong password', async () => {
    const stored = await hashPassword('real-password');
    await burnPasswordCheck('warm-up');
    const time = async (f: () => Promise<unknown>) => {
      const start = performance.now();
      for (let i = 0; i < 5; i++) await f();
      return performance.now() - start;
    };
    const wrong = await time(() => verifyPassword('guess', stored));
    const unknown = await time(() => burnPasswordCheck('guess'));
    // same scrypt cost on both paths; the bound is loose because test machines are noisy
    expect(unknown / wrong).toBeGreaterThan(0.5);
    expect(unknown / wrong).toBeLessThan(2);
  });

  it('makes temporary passwords of 20 URL-safe characters that pass the length rule', () => {
    const p = generateTemporaryPassword();
    expect(p).toMatch(/^[A-Za-z0-9_-]{20}$/);
    expect(generateTemporaryPassword()).not.toBe(p);
  });
});
