import { isIP } from 'node:net';

/**
 * Which proxies in front of the server may say who the client is (X-Forwarded-For, -Proto, -Host): none, the nearest
 * `hops`, or the listed addresses and subnets. Handed to Express's `trust proxy` setting as it is.
 */
export type TrustProxy = false | number | string[];

// the names Express's `trust proxy` setting accepts for the reserved ranges (Express 5 API, "trust proxy" setting)
const namedRanges = new Set(['loopback', 'linklocal', 'uniquelocal']);

/** Checks one address, subnet in CIDR notation, or named range; returns a message when it is not one. */
function problemWith(entry: string): string | undefined {
  if (namedRanges.has(entry)) return undefined;
  const [address, prefix, extra] = entry.split('/');
  const family = isIP(address ?? '');
  if (!family || extra !== undefined) return `"${entry}" is not an IP address or subnet`;
  if (prefix === undefined) return undefined;
  const bits = family === 4 ? 32 : 128;
  if (!/^\d{1,3}$/.test(prefix) || Number(prefix) > bits) {
    return `"${entry}" has a prefix length outside 0–${bits}`;
  }
  return undefined;
}

/**
 * Reads TRUST_PROXY: `false` (or unset) trusts no proxy, so a client cannot choose its own address with
 * X-Forwarded-For; a whole number from 1 to 10 trusts that many hops in front; a comma-separated list trusts those
 * addresses, subnets (`10.0.0.0/8`) and named ranges (`loopback`, `linklocal`, `uniquelocal`). `true` is refused:
 * trusting every hop lets any client set its own address.
 *
 * @example
 * parseTrustProxy('1'); // 1
 * parseTrustProxy('loopback, 10.1.0.0/16'); // ['loopback', '10.1.0.0/16']
 * parseTrustProxy('true'); // throws: names TRUST_PROXY and says what to use instead
 */
export function parseTrustProxy(value: string | undefined): TrustProxy {
  const text = (value ?? '').trim();
  if (text === '' || text === 'false' || text === '0') return false;
  if (text === 'true') {
    throw new Error(
      'TRUST_PROXY: "true" would trust every hop, so any client could set its own address; give the number of proxies in front (e.g. 1) or their addresses',
    );
  }
  if (/^\d+$/.test(text)) {
    const hops = Number(text);
    // ten proxies in a row is far beyond any lab's set-up; more is a typo (our choice)
    if (hops > 10) throw new Error(`TRUST_PROXY: expected a hop count from 1 to 10 but received ${hops}`);
    return hops;
  }
  const entries = text.split(',').map((entry) => entry.trim());
  const problems = entries.map((entry) => (entry ? problemWith(entry) : 'an empty entry'));
  const first = problems.find(Boolean);
  if (first) {
    throw new Error(
      `TRUST_PROXY: ${first}; use false, a hop count, or comma-separated addresses, subnets or loopback/linklocal/uniquelocal`,
    );
  }
  return entries;
}
