import { mkdtempSync, readdirSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { createFileStore, sha256Hex } from './file-store';

const dir = mkdtempSync(join(tmpdir(), 'clearbase-store-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));
const store = createFileStore(dir);

describe('file store', () => {
  it('names files by the SHA-256 of their bytes, two hex digits as the folder', async () => {
    const bytes = new TextEncoder().encode('abc');
    const { sha256, created } = await store.putBytes(bytes);
    // FIPS 180-2 appendix B.1: SHA-256("abc")
    expect(sha256).toBe('ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad');
    expect(created).toBe(true);
    expect(store.pathOf(sha256)).toBe(join(dir, 'files', 'ba', sha256.slice(2)));
    expect(readFileSync(store.pathOf(sha256), 'utf8')).toBe('abc');
  });

  it('keeps the same bytes once and leaves no temp file', async () => {
    const bytes = new TextEncoder().encode('same bytes');
    const first = await store.putBytes(bytes);
    const temp = store.tempPath();
    writeFileSync(temp, bytes);
    const second = await store.adopt(temp, sha256Hex(bytes));
    expect(first.created).toBe(true);
    expect(second.created).toBe(false);
    expect(readdirSync(store.tmpDir)).toEqual([]);
  });

  it('refuses a name that is not a SHA-256', () => {
    expect(() => store.pathOf('../../etc/passwd')).toThrow('Expected 64 hex digits for sha256');
  });
});
