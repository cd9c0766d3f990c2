import type { Response } from 'express';
import { endianness } from 'node:os';

const littleEndianHost = endianness() === 'LE';

/**
 * The bytes of 16-bit samples in little-endian order, as the API's raw pixel bodies promise: a view of the same
 * memory on a little-endian host, a swapped copy on a big-endian one.
 * @example littleEndianBytes(Uint16Array.of(1)) // <Buffer 01 00>
 */
export function littleEndianBytes(samples: Uint16Array): Buffer {
  const bytes = Buffer.from(samples.buffer, samples.byteOffset, samples.byteLength);
  return littleEndianHost ? bytes : Buffer.from(bytes).swap16();
}

/** A raw pixel reply: its samples (or their little-endian bytes), caching, and the headers describing them. */
export interface RawPixelsReply {
  /** Interleaved 16-bit RGB, row by row: samples in memory, or bytes already little-endian. */
  pixels: Uint16Array | Buffer;
  /** The Cache-Control header. */
  cacheControl: string;
  /** The headers that describe the pixels (size, film base...). */
  headers: Record<string, string>;
}

/**
 * Replies 200 with raw little-endian 16-bit RGB as application/octet-stream, its description in headers.
 * @example sendRawPixels(res, { pixels: negative.data, cacheControl: 'private, no-cache', headers: { 'X-Negative-Width': '1500' } })
 */
export function sendRawPixels(res: Response, reply: RawPixelsReply): void {
  const body = Buffer.isBuffer(reply.pixels) ? reply.pixels : littleEndianBytes(reply.pixels);
  res
    .status(200)
    .set({
      ...reply.headers,
      'Content-Type': 'application/octet-stream',
      'Cache-Control': reply.cacheControl,
    })
    .end(body);
}
