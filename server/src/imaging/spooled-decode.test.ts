import { existsSync, watch } from 'node:fs';
import { mkdir, mkdtemp, readdir, readFile, rm, stat, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import sharp from 'sharp';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { ImageInputError, readNegative } from './index';
import { SPOOL_MIN_FREE_BYTES, spoolDir, spoolHasRoom, startSpooledDecode } from './spooled-decode';

let dir: string;
beforeAll(async () => {
  dir = await mkdtemp(join(tmpdir(), 'clearbase-spool-'));
});
afterAll(async () => {
  await rm(dir, { recursive: true, force: true });
});

/** This process's spool files. */
async function ownSpools(): Promise<string[]> {
  return readdir(spoolDir()!);
}

/** A 16-bit deflate TIFF of values no 8-bit detour keeps, several strips tall. */
async function tiff16(
  name: string,
  width: number,
  height: number,
): Promise<{ path: string; data: Uint16Array }> {
  const data = new Uint16Array(width * height * 3);
  for (let i = 0; i < data.length; i++) data[i] = (i * 7919 + 12345) % 65521;
  const path = join(dir, name);
  await sharp(data, { raw: { width, height, channels: 3 } })
    .toColourspace('rgb16')
    .tiff({ compression: 'deflate', predictor: 'horizontal' })
    .toFile(path);
  return { path, data };
}

// readNegative spools only where there is room (elsewhere it decodes into memory, which imaging.test.ts covers).
const shm = existsSync('/dev/shm') && spoolHasRoom('/dev/shm', SPOOL_MIN_FREE_BYTES);

describe.runIf(shm)('decoding through a spool file', () => {
  it('spools into a private directory of its own, and removes those of processes that are gone', async () => {
    // A pid no process has now (the first free one counting down from the largest usual pid).
    let gone = 4_194_000;
    for (; gone > 1; gone--) {
      try {
        process.kill(gone, 0);
      } catch (error) {
        if ((error as NodeJS.ErrnoException).code === 'ESRCH') break;
      }
    }
    const stale = `/dev/shm/clearbase-decode-${gone}-test`;
    const live = `/dev/shm/clearbase-decode-${process.ppid}-test`;
    await mkdir(stale);
    await writeFile(join(stale, '1.v'), 'left over');
    const hadLive = existsSync(live);
    if (!hadLive) await mkdir(live);
    try {
      const own = spoolDir()!;
      expect(own).toMatch(new RegExp(`^/dev/shm/clearbase-decode-${process.pid}-`));
      expect((await stat(own)).mode & 0o777).toBe(0o700);
      expect(existsSync(stale)).toBe(false);
      expect(existsSync(live)).toBe(true);
    } finally {
      await rm(stale, { recursive: true, force: true });
      if (!hadLive) await rm(live, { recursive: true, force: true });
    }
  });

  it('reads the same bytes as the decode into memory, told as they land, and leaves no file', async () => {
    const { path, data } = await tiff16('spool.tif', 1200, 900);
    const target = new Uint8Array(data.byteLength);
    const told: number[] = [];
    const spool = startSpooledDecode(sharp(path).toColourspace('rgb16'), spoolDir()!);
    try {
      await spool.readInto(target, 1200, 900, (bytes) => told.push(bytes));
    } finally {
      await spool.discard();
    }
    expect(Buffer.from(target.buffer).equals(Buffer.from(data.buffer))).toBe(true);
    expect(told.at(-1)).toBe(data.byteLength);
    expect(told.every((b, k) => k === 0 || b > told[k - 1]!)).toBe(true);
    expect(await ownSpools()).toEqual([]);
  });

  it('refuses a spool that does not hold the frame the header promised', async () => {
    const { path } = await tiff16('other-size.tif', 64, 40);
    const spool = startSpooledDecode(sharp(path).toColourspace('rgb16'), spoolDir()!);
    try {
      await expect(spool.readInto(new Uint8Array(64 * 41 * 6), 64, 41, () => undefined)).rejects.toThrow(
        /Expected a little-endian 64 × 41 16-bit RGB spool/,
      );
    } finally {
      await spool.discard();
    }
    expect(await ownSpools()).toEqual([]);
  });

  it('reads a 16-bit TIFF into a shared buffer through the spool with the same pixels', async () => {
    const { path, data } = await tiff16('shared.tif', 700, 500);
    const spooled: string[] = [];
    const watcher = watch(spoolDir()!, (_, name) => {
      if (name) spooled.push(name);
    });
    const img = await readNegative(path, { shared: true }).finally(() => watcher.close());
    expect(spooled.length).toBeGreaterThan(0);
    expect(img.data.buffer).toBeInstanceOf(SharedArrayBuffer);
    expect(Buffer.from(img.data.buffer).equals(Buffer.from(data.buffer))).toBe(true);
    expect(await ownSpools()).toEqual([]);
  });

  it('rejects a 16-bit TIFF with damaged pixel data, gives its buffer back and leaves no spool file', async () => {
    const { path } = await tiff16('whole.tif', 700, 500);
    const whole = await readFile(path);
    // The header and the directory (at the end) intact, the compressed strips in the middle overwritten.
    whole.fill(0x55, Math.floor(whole.length * 0.4), Math.floor(whole.length * 0.6));
    const cut = join(dir, 'damaged.tif');
    await writeFile(cut, whole);
    const allocated: Uint16Array[] = [];
    const released: Uint16Array[] = [];
    const error = await readNegative(cut, {
      allocate: (n) => {
        allocated.push(new Uint16Array(new SharedArrayBuffer(n * 2)));
        return allocated.at(-1)!;
      },
      release: (array) => released.push(array),
    }).catch((e: unknown) => e);
    expect(error).toBeInstanceOf(ImageInputError);
    expect((error as ImageInputError).code).toBe('truncated');
    // The failed spooled read and the decode after it share one buffer, given back when the read fails.
    expect(allocated).toHaveLength(1);
    expect(released).toHaveLength(1);
    expect(released[0]).toBe(allocated[0]);
    expect(await ownSpools()).toEqual([]);
  });

  it('ends a spooled read with what onRows threw, not with a second decode', async () => {
    const { path } = await tiff16('callback.tif', 700, 500);
    const thrown = new Error('measurement failed');
    let calls = 0;
    let released = 0;
    const error = await readNegative(path, {
      shared: true,
      onRows: () => {
        calls++;
        throw thrown;
      },
      allocate: (n) => new Uint16Array(new SharedArrayBuffer(n * 2)),
      release: () => released++,
    }).catch((e: unknown) => e);
    expect(error).toBe(thrown);
    expect(calls).toBe(1);
    expect(released).toBe(1);
    expect(await ownSpools()).toEqual([]);
  });

  it('reads an 8-bit TIFF into a shared buffer (first spooled as 16-bit, then decoded at 8)', async () => {
    const path = join(dir, 'eight.tif');
    await sharp(new Uint8Array(40 * 30 * 3).fill(200), { raw: { width: 40, height: 30, channels: 3 } })
      .tiff()
      .toFile(path);
    const img = await readNegative(path, { shared: true });
    expect(img.bitDepth).toBe(8);
    expect(img.data.every((v) => v === 200 * 257)).toBe(true);
    expect(await ownSpools()).toEqual([]);
  });
});
