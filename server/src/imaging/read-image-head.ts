import { open, stat } from 'node:fs/promises';
import { ImageInputError } from './image-input-error';
import { sniffFormat, type SniffedFormat } from './sniff-format';

/** The first bytes of an image file and the container they name. */
export interface ImageHead {
  /** Up to 32 bytes: enough for the format's signature and a PNG's bit depth. */
  head: Uint8Array;
  format: Exclude<SniffedFormat, 'unknown'>;
}

/**
 * Reads a file's first bytes and names its container, without decoding anything.
 *
 * Throws `ImageInputError` with code `missing` (no such file), `empty` (0 bytes) or `not-an-image` (it starts like
 * neither a TIFF, a PNG nor a JPEG).
 *
 * @example
 *   const { format } = await readImageHead('roll-12/frame-03.tif'); // 'tiff'
 */
export async function readImageHead(path: string): Promise<ImageHead> {
  let size: number;
  try {
    size = (await stat(path)).size;
  } catch (cause) {
    throw new ImageInputError('missing', `No file was found at ${path}.`, { cause });
  }
  if (size === 0) throw new ImageInputError('empty', 'The file is empty (0 bytes).');
  const handle = await open(path, 'r');
  let head: Uint8Array;
  try {
    const bytes = new Uint8Array(32);
    const { bytesRead } = await handle.read(bytes, 0, bytes.length, 0);
    head = bytes.subarray(0, bytesRead);
  } finally {
    await handle.close();
  }
  const format = sniffFormat(head);
  if (format === 'unknown') {
    throw new ImageInputError(
      'not-an-image',
      'The file is not an image: it does not start like a TIFF, PNG or JPEG file.',
    );
  }
  return { head, format };
}
