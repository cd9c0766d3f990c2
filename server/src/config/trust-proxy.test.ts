import { describe, expect, it } from 'vitest';
import { ConfigError, loadConfig } from './config';
import { parseTrustProxy } from './trust-proxy';

describe('TRUST_PROXY', () => {
  it('trusts no proxy when unset, empty, false or 0', () => {
    for (const value of [undefined, '', 'false', '0', ' false ']) expect(parseTrustProxy(value)).toBe(false);
  });

  it('takes a hop count from 1 to 10', () => {
    expect(parseTrustProxy('1')).toBe(1);
    expect(parseTrustProxy('10')).toBe(10);
    expect(() => parseTrustProxy('11')).toThrow(
      'TRUST_PROXY: expected a hop count from 1 to 10 but received 11',
    );
  });

  it('takes addresses, subnets and the named ranges, comma-separated', () => {
    expect(parseTrustProxy('loopback, 10.1.0.0/16,fd00::1, 192.0.2.7')).toEqual([
      'loopback',
      '10.1.0.0/16',
      'fd00::1',
      '192.0.2.7',
    ]);
  });

  it('refuses true, which would let any client choose its own address', () => {
    expect(() => parseTrustProxy('true')).toThrow(/would trust every hop/);
  });

  it('names the entry that is not an address or subnet', () => {
    expect(() => parseTrustProxy('10.0.0.0/33')).toThrow(/"10.0.0.0\/33" has a prefix length outside 0–32/);
    expect(() => parseTrustProxy('proxy.lab.test')).toThrow(
      /"proxy.lab.test" is not an IP address or subnet/,
    );
    expect(() => parseTrustProxy('10.0.0.1,,10.0.0.2')).toThrow(/an empty entry/);
  });

  it('is checked at start: a bad value stops the configuration naming the variable', () => {
    expect(() =>
      loadConfig({ DATA_DIR: '/tmp', SESSION_SECRET: 'x'.repeat(32), TRUST_PROXY: 'yes' }),
    ).toThrow(ConfigError);
    expect(() =>
      loadConfig({ DATA_DIR: '/tmp', SESSION_SECRET: 'x'.repeat(32), TRUST_PROXY: 'yes' }),
    ).toThrow(/TRUST_PROXY/);
  });

  it('stays off with an https public address: a proxy is trusted only when named', () => {
    const config = loadConfig({
      DATA_DIR: '/tmp',
      SESSION_SECRET: 'x'.repeat(32),
      PUBLIC_URL: 'https://lab.example.test',
    });
    expect(config.trustProxy).toBe(false);
  });
});
