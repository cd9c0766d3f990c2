import { existsSync, mkdtempSync, readdirSync, rmSync, statfsSync } from 'node:fs';
import { open, rm, type FileHandle } from 'node:fs/promises';
import { endianness } from 'node:os';
import { join } from 'node:path';
import type { Sharp } from 'sharp';

/**
 * Decoding through a spool file in memory-backed storage (/dev/shm): libvips writes the decoded pixels as its own
 * uncompressed format (a 64-byte header, then the pixels row after row, then an XML trailer) strip by strip as it
 * decodes, and the reader copies each part into the frame's array as soon as it is written, so the copy and whatever
 * the caller does with the rows (`readNegative`'s `onRows`) happen while later rows are still being decoded. It is
 * also faster than libvips' decode into memory (`toBuffer`) by itself, for reasons we have not pinned down: at 24 MP
 * on our two-core machine, 0.64–0.81 s into a new array and 0.57–0.71 s into a reused one, against 0.97–1.14 s (see
 * bench/README.md). The pixels are the same bytes (tested).
 */

/** The libvips file header's size (libvips' VIPS_SIZEOF_HEADER). */
export const SPOOL_HEADER_BYTES = 64;
/** The header's first four bytes for pixels in little-endian order (libvips' VIPS_MAGIC_INTEL, written big-endian). */
const MAGIC_LITTLE_ENDIAN = 0xb6a6f208;
/** libvips' band format code for unsigned 16-bit samples (VIPS_FORMAT_USHORT). */
const FORMAT_USHORT = 2;
const PREFIX = 'clearbase-decode-';
/** How long the reader waits for libvips to write more before looking again. Our choice. */
const POLL_MS = 2;
/** Bytes read from the spool at a time: big enough that the reads cost little, small enough to follow the decode. */
const READ_BYTES = 4 << 20;

export interface SpooledDecode {
  /**
   * Reads the decoded 16-bit RGB pixels into `target` (exactly width × height × 6 bytes) as libvips writes them,
   * calling `onBytes(total)` after each read with how many bytes are in place. Throws `error` of the decode if it
   * fails, and a RangeError if the spool does not hold a width × height 16-bit RGB image.
   */
  readInto(
    target: Uint8Array,
    width: number,
    height: number,
    onBytes: (bytes: number) => void,
  ): Promise<void>;
  /** Waits for the decode to end, whatever its outcome, and removes the spool file; later calls do nothing. */
  discard(): Promise<void>;
}

/**
 * A spool is started only when `spoolHasRoom(dir, SPOOL_MIN_FREE_BYTES)`: the decode starts before the header says
 * the frame's size, which is checked again then. Our choice.
 */
export const SPOOL_MIN_FREE_BYTES = 1 << 30;

let spoolDirectory: string | null | undefined;

/**
 * Where this process's spool files go: a directory of its own in /dev/shm, made the first time (unguessable and
 * private, so no one else can put a file or a link where libvips will write) and removed when the process exits; or
 * null where there is no /dev/shm (then decode with `toBuffer`). Such directories that processes now gone left
 * behind are removed the first time.
 */
export function spoolDir(): string | null {
  if (spoolDirectory !== undefined) return spoolDirectory;
  spoolDirectory = null;
  const shm = '/dev/shm';
  try {
    // The spool holds pixels in little-endian order, read as this machine's own.
    if (endianness() !== 'LE' || !existsSync(shm)) return null;
    try {
      sweepStale(shm);
    } catch {
      // a sweep that fails leaves leftovers, not this process without a spool
    }
    const dir = mkdtempSync(join(shm, `${PREFIX}${process.pid}-`));
    process.once('exit', () => rmSync(dir, { recursive: true, force: true }));
    spoolDirectory = dir;
  } catch {
    spoolDirectory = null;
  }
  return spoolDirectory;
}

/** Whether `dir` has room for a spool file of `bytes` (with as much again to spare, so others are not starved). */
export function spoolHasRoom(dir: string, bytes: number): boolean {
  try {
    const s = statfsSync(dir);
    return s.bavail * s.bsize >= 2 * bytes;
  } catch {
    return false;
  }
}

function sweepStale(shm: string): void {
  for (const name of readdirSync(shm)) {
    const pid = Number(new RegExp(`^${PREFIX}(\\d+)-`).exec(name)?.[1]);
    if (!pid || pid === process.pid || isAlive(pid)) continue;
    try {
      rmSync(join(shm, name), { recursive: true, force: true });
    } catch {
      // another user's: not ours to remove
    }
  }
}

function isAlive(pid: number): boolean {
  try {
    process.kill(pid, 0);
    return true;
  } catch (error) {
    return (error as NodeJS.ErrnoException).code === 'EPERM';
  }
}

let spoolCount = 0;

/** Starts `pipeline` (which must end in 16-bit RGB) writing to a new spool file in `dir`. */
export function startSpooledDecode(pipeline: Sharp, dir: string): SpooledDecode {
  const path = join(dir, `${++spoolCount}.v`);
  let settled = false;
  let failure: unknown = null;
  // The `.v` suffix selects libvips' own format.
  const job = pipeline.toFile(path).then(
    () => {
      settled = true;
    },
    (error: unknown) => {
      settled = true;
      failure = error;
    },
  );
  const wait = () => new Promise((resolve) => setTimeout(resolve, POLL_MS));
  let discarded = false;

  /** Fills `into` from byte `position` of the spool, waiting for libvips to write what is not there yet. */
  async function readWritten(
    handle: FileHandle,
    into: Uint8Array,
    position: number,
    onBytes?: (bytes: number) => void,
  ): Promise<void> {
    let got = 0;
    while (got < into.byteLength) {
      // Seen before the read: a read that then finds nothing means the file ends there.
      const ended = settled;
      const { bytesRead } = await handle.read(
        into,
        got,
        Math.min(READ_BYTES, into.byteLength - got),
        position + got,
      );
      if (bytesRead) {
        got += bytesRead;
        onBytes?.(got);
        continue;
      }
      if (failure) throw failure;
      if (ended)
        throw new RangeError(
          `The spool file ended at byte ${position + got} of ${position + into.byteLength}`,
        );
      await wait();
    }
  }

  return {
    async readInto(target, width, height, onBytes) {
      const total = width * height * 6;
      if (target.byteLength !== total)
        throw new RangeError(`Expected a target of ${total} bytes but received ${target.byteLength}`);
      let handle: FileHandle | null = null;
      try {
        // libvips creates the file when it starts writing.
        while (!handle) {
          if (settled && failure) throw failure;
          try {
            handle = await open(path, 'r');
          } catch (error) {
            if ((error as NodeJS.ErrnoException).code !== 'ENOENT') throw error;
            if (settled) throw failure ?? new Error('the decode ended without writing its spool file');
            await wait();
          }
        }
        const header = Buffer.alloc(SPOOL_HEADER_BYTES);
        await readWritten(handle, header, 0);
        checkHeader(header, width, height);
        await readWritten(handle, target, SPOOL_HEADER_BYTES, onBytes);
        await job;
        if (failure) throw failure;
      } finally {
        await handle?.close();
      }
    },
    async discard() {
      if (discarded) return;
      discarded = true;
      await job;
      await rm(path, { force: true });
    },
  };
}

function checkHeader(header: Buffer, width: number, height: number): void {
  const magic = header.readUInt32BE(0);
  const fields = {
    width: header.readInt32LE(4),
    height: header.readInt32LE(8),
    bands: header.readInt32LE(12),
    format: header.readInt32LE(20),
  };
  if (
    magic !== MAGIC_LITTLE_ENDIAN ||
    fields.width !== width ||
    fields.height !== height ||
    fields.bands !== 3 ||
    fields.format !== FORMAT_USHORT
  ) {
    throw new RangeError(
      `Expected a little-endian ${width} × ${height} 16-bit RGB spool but its header says ${JSON.stringify({ magic: magic.toString(16), ...fields })}`,
    );
  }
}
