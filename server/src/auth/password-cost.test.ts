import type * as Crypto from 'node:crypto';
import { describe, expect, it, vi } from 'vitest';

// every scrypt derivation the module makes, with its cost, recorded on the way to the real function
const calls: { N?: number; r?: number; p?: number; keyBytes: number }[] = [];
vi.mock('node:crypto', async (importOriginal) => {
  const crypto = await importOriginal<typeof Crypto>();
  return {
    ...crypto,
    scrypt: (...args: Parameters<typeof crypto.scrypt>) => {
      const [, , keyBytes, options] = args as unknown as [
        unknown,
        unknown,
        number,
        { N: number; r: number; p: number },
      ];
      calls.push({ N: options.N, r: options.r, p: options.p, keyBytes });
      return (crypto.scrypt as (...a: unknown[]) => void)(...args);
    },
  };
});

const { burnPasswordCheck, hashPassword, verifyPassword } = await import('./password-hash');

describe('the work of a password check', () => {
  it('is one scrypt derivation of the same cost for an unknown e-mail as for a wrong password', async () => {
    const stored = await hashPassword('real-password');
    await burnPasswordCheck('warm-up');
    calls.length = 0;
    await verifyPassword('guess', stored);
    const wrong = calls.splice(0);
    await burnPasswordCheck('guess');
    const unknown = calls.splice(0);
    expect(wrong).toHaveLength(1);
    expect(unknown).toEqual(wrong);
  });
});
