import type { RgbImage } from '@clearbase/inversion';
import { createHash } from 'node:crypto';
import { open, readFile, unlink } from 'node:fs/promises';
import { endianness } from 'node:os';
import type { FileStore } from '../files/file-store';
import { littleEndianBytes } from '../http/send-raw-pixels';
import { readNegative } from '../imaging/index';
import { makeWorkingNegativeOffThread } from './working-negative-worker';

/** Names the layout of a stored working negative; a new layout or reduction gets a new name, so new keys. */
const LAYOUT = 'clearbase working negative 1';
// pixel data starts on an 8-byte boundary so it can be viewed as 16-bit samples in place (our choice)
const ALIGN = 8;

/** A frame's working negative as kept in the file store. */
export interface WorkingNegative {
  width: number;
  height: number;
  /** Size of the full scan it was reduced from. */
  scanWidth: number;
  scanHeight: number;
  /** The working negative's pixels: raw little-endian 16-bit RGB, as the API sends them. */
  pixels: Buffer;
  /** `levelSample` of the full scan: its levels measured with `{ step: 1 }` are the full scan's. */
  sample: RgbImage;
}

/** Working negatives by source file, made once and kept in the file store. */
export interface WorkingNegativeCache {
  /** How many working negatives this cache has made from their scans (rather than read back) so far. */
  readonly made: number;
  /**
   * The working negative of a stored scan at a long edge: read from the store, or made once (the scan decoded with
   * sharp's asynchronous API, reduced and sampled on a worker thread) and stored. Requests for the same scan while
   * it is being made wait for that one making.
   */
  get(
    source: { sha256: string; path: string },
    longEdge: number,
    maxPixels: number,
  ): Promise<WorkingNegative>;
}

interface Header {
  layout: string;
  width: number;
  height: number;
  scanWidth: number;
  scanHeight: number;
  sampleWidth: number;
  sampleHeight: number;
}

/**
 * Where a scan's working negative at a long edge is kept in the file store: the SHA-256 of the layout's name, the
 * source's SHA-256 and the long edge. The bytes under that name are always the same (the reduction is
 * deterministic), so the store's promise holds: a name never points at different bytes.
 * @example store.pathOf(workingNegativeKey(file.sha256, 1500))
 */
export function workingNegativeKey(sourceSha256: string, longEdge: number): string {
  return createHash('sha256').update(`${LAYOUT}\n${sourceSha256}\n${longEdge}`).digest('hex');
}

const littleEndian = endianness() === 'LE';

/** One file: a 4-byte length, the JSON header, padding to ALIGN, the working pixels, the sample's pixels. */
export function encodeWorkingNegative(
  working: RgbImage,
  sample: RgbImage,
  scan: { width: number; height: number },
): Buffer {
  const header: Header = {
    layout: LAYOUT,
    width: working.width,
    height: working.height,
    scanWidth: scan.width,
    scanHeight: scan.height,
    sampleWidth: sample.width,
    sampleHeight: sample.height,
  };
  const json = Buffer.from(JSON.stringify(header));
  const length = Buffer.alloc(4);
  length.writeUInt32LE(json.length);
  const pad = Buffer.alloc((ALIGN - ((4 + json.length) % ALIGN)) % ALIGN);
  return Buffer.concat([length, json, pad, littleEndianBytes(working.data), littleEndianBytes(sample.data)]);
}

/** Reads a stored working negative back; null when the bytes are not one (cut short, or another layout). */
export function decodeWorkingNegative(bytes: Buffer): WorkingNegative | null {
  if (bytes.length < 4) return null;
  const jsonLength = bytes.readUInt32LE(0);
  if (4 + jsonLength > bytes.length) return null;
  let header: Header;
  try {
    header = JSON.parse(bytes.subarray(4, 4 + jsonLength).toString('utf8')) as Header;
  } catch {
    return null;
  }
  if (header.layout !== LAYOUT) return null;
  const start = 4 + jsonLength + ((ALIGN - ((4 + jsonLength) % ALIGN)) % ALIGN);
  const workingBytes = header.width * header.height * 6;
  const sampleBytes = header.sampleWidth * header.sampleHeight * 6;
  if (bytes.length !== start + workingBytes + sampleBytes) return null;
  const sampleData = new Uint16Array(sampleBytes / 2);
  const sampleView = Buffer.from(sampleData.buffer);
  bytes.copy(sampleView, 0, start + workingBytes);
  if (!littleEndian) sampleView.swap16();
  return {
    width: header.width,
    height: header.height,
    scanWidth: header.scanWidth,
    scanHeight: header.scanHeight,
    pixels: bytes.subarray(start, start + workingBytes),
    sample: { width: header.sampleWidth, height: header.sampleHeight, data: sampleData },
  };
}

const caches = new Map<string, WorkingNegativeCache>();

/**
 * The working negative cache of a file store, one per store folder in this process.
 * @example const negative = await workingNegativeCacheOf(store).get({ sha256, path }, 1500, config.uploads.maxPixels);
 */
export function workingNegativeCacheOf(store: FileStore): WorkingNegativeCache {
  let cache = caches.get(store.root);
  if (!cache) {
    cache = createWorkingNegativeCache(store);
    caches.set(store.root, cache);
  }
  return cache;
}

function createWorkingNegativeCache(store: FileStore): WorkingNegativeCache {
  const making = new Map<string, Promise<WorkingNegative>>();
  let made = 0;

  const readStored = async (key: string): Promise<WorkingNegative | null> => {
    const bytes = await readFile(store.pathOf(key)).catch(() => null);
    if (!bytes) return null;
    const stored = decodeWorkingNegative(bytes);
    // bytes that are not a working negative of this layout are made again in their place
    if (!stored) await store.remove(key);
    return stored;
  };

  const make = async (key: string, path: string, longEdge: number, maxPixels: number) => {
    const scan = await readNegative(path, { maxPixels });
    const size = { width: scan.width, height: scan.height };
    const { working, sample } = await makeWorkingNegativeOffThread({ kind: 'make', image: scan, longEdge });
    const bytes = encodeWorkingNegative(working, sample, size);
    const temp = store.tempPath('-working');
    const handle = await open(temp, 'wx');
    try {
      await handle.writeFile(bytes);
      await handle.sync();
    } catch (err) {
      await handle.close();
      await unlink(temp).catch(() => undefined);
      throw err;
    }
    await handle.close();
    await store.adopt(temp, key);
    made++;
    return decodeWorkingNegative(bytes)!;
  };

  return {
    get made() {
      return made;
    },
    async get(source, longEdge, maxPixels) {
      const key = workingNegativeKey(source.sha256, longEdge);
      const pending = making.get(key);
      if (pending) return pending;
      const task = (async () =>
        (await readStored(key)) ?? (await make(key, source.path, longEdge, maxPixels)))();
      making.set(key, task);
      try {
        return await task;
      } finally {
        making.delete(key);
      }
    },
  };
}
