import { readFile, writeFile } from 'node:fs/promises';
import sharp from 'sharp';

/**
 * Writes a flat-coloured 16-bit deflate TIFF: a few hundred KB on disk, width × height × 6 bytes once decoded, in
 * strips of `rowsPerStrip` rows (libvips' choice when not given).
 */
export async function flatTiff(
  path: string,
  width: number,
  height: number,
  rowsPerStrip?: number,
): Promise<string> {
  await sharp({ create: { width, height, channels: 3, background: { r: 200, g: 120, b: 80 } } })
    .toColourspace('rgb16')
    // libvips writes strips of `tileHeight` rows when the TIFF is not tiled
    .tiff({
      compression: 'deflate',
      predictor: 'horizontal',
      ...(rowsPerStrip ? { tileHeight: rowsPerStrip } : {}),
    })
    .toFile(path);
  return path;
}

/**
 * Overwrites the compressed bytes of one strip of a little-endian TIFF as written by `flatTiff`, past their first two
 * (StripOffsets is tag 273, StripByteCounts 279: TIFF 6.0 section 3).
 */
export async function damageStrip(path: string, strip: number | 'last'): Promise<void> {
  const bytes = await readFile(path);
  const ifd = bytes.readUInt32LE(4);
  const entry = (tag: number) => {
    for (let i = 0; i < bytes.readUInt16LE(ifd); i++) {
      const at = ifd + 2 + 12 * i;
      if (bytes.readUInt16LE(at) === tag)
        return { count: bytes.readUInt32LE(at + 4), value: bytes.readUInt32LE(at + 8) };
    }
    throw new Error(`no tag ${tag} in ${path}`);
  };
  const offsets = entry(273);
  const k = strip === 'last' ? offsets.count - 1 : strip;
  const offset = bytes.readUInt32LE(offsets.value + 4 * k);
  const length = bytes.readUInt32LE(entry(279).value + 4 * k);
  bytes.fill(0xa5, offset + 2, offset + length);
  await writeFile(path, bytes);
}
