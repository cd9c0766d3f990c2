import { describe, expect, it } from 'vitest';
import { generateTemporaryPassword, hashPassword, verifyPassword } from './password-hash';

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

  it('makes temporary passwords of 20 URL-safe characters that pass the length rule', () => {
    const p = generateTemporaryPassword();
    expect(p).toMatch(/^[A-Za-z0-9_-]{20}$/);
    expect(generateTemporaryPassword()).not.toBe(p);
  });
});
