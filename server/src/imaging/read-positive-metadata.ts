import sharp from 'sharp';
import { parsePositiveXmp, type PositiveMetadata } from './positive-metadata';

/**
 * Reads the metadata `writePositive` embedded in a file, plus its stored bit depth and whether an
 * ICC profile is present.
 */
export async function readPositiveMetadata(path: string): Promise<{
  metadata: PositiveMetadata;
  bitDepth: number;
  hasIccProfile: boolean;
  exifDescription?: string;
}> {
  const meta = await sharp(path).metadata();
  const exif = meta.exif?.toString('latin1');
  const description = exif ? /Clearbase positive[^\0]*/.exec(exif)?.[0] : undefined;
  return {
    metadata: meta.xmpAsString ? parsePositiveXmp(meta.xmpAsString) : {},
    bitDepth: meta.depth === 'ushort' ? 16 : 8,
    hasIccProfile: Boolean(meta.icc),
    ...(description ? { exifDescription: description } : {}),
  };
}
