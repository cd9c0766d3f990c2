import { randomBytes, scrypt, timingSafeEqual, type ScryptOptions } from 'node:crypto';

// N=2^14, r=8, p=1 (16 MiB): the scrypt paper's interactive-login parameters, Percival 2009, section 7
const defaultCost = { N: 16384, r: 8, p: 1 };
// 16-byte salt and 32-byte key: RFC 7914 section 2 leaves them to the user; NIST SP 800-132 asks salt >= 128 bits
const saltBytes = 16;
const keyBytes = 32;

function derive(password: string, salt: Buffer, cost: typeof defaultCost): Promise<Buffer> {
  const options: ScryptOptions = { ...cost, maxmem: 64 * 1024 * 1024 };
  return new Promise((resolve, reject) =>
    scrypt(password.normalize('NFKC'), salt, keyBytes, options, (err, key) =>
      err ? reject(err) : resolve(key),
    ),
  );
}

/**
 * Hashes a password with scrypt and a fresh per-user salt.
 *
 * @example
 * const stored = await hashPassword('clearbase-demo'); // 'scrypt$16384$8$1$<salt>$<key>'
 */
export async function hashPassword(password: string): Promise<string> {
  const salt = randomBytes(saltBytes);
  const key = await derive(password, salt, defaultCost);
  const { N, r, p } = defaultCost;
  return ['scrypt', N, r, p, salt.toString('base64url'), key.toString('base64url')].join('$');
}

/** Checks a password against a stored hash in constant time; a malformed hash never matches. */
export async function verifyPassword(password: string, stored: string): Promise<boolean> {
  const parts = stored.split('$');
  if (parts.length !== 6 || parts[0] !== 'scrypt') return false;
  const [N, r, p] = parts.slice(1, 4).map(Number) as [number, number, number];
  const salt = Buffer.from(parts[4]!, 'base64url');
  const expected = Buffer.from(parts[5]!, 'base64url');
  const actual = await derive(password, salt, { N, r, p });
  return actual.length === expected.length && timingSafeEqual(actual, expected);
}

let dummyHash: Promise<string> | undefined;

/** Spends the same work as a real check, so an unknown e-mail answers as slowly as a wrong password. */
export async function burnPasswordCheck(password: string): Promise<false> {
  dummyHash ??= hashPassword(randomBytes(12).toString('base64url'));
  await verifyPassword(password, await dummyHash);
  return false;
}

/** A readable random password for accounts an admin creates without one. */
export function generateTemporaryPassword(): string {
  // 15 bytes = 120 bits of entropy, 20 base64url characters: above NIST SP 800-63B's 112-bit guidance for secrets
  return randomBytes(15).toString('base64url');
}
