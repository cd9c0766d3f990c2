import sharp from 'sharp';
import type { Metadata } from 'sharp';
import { damagedImageError } from './damaged-image-error';
import { ImageInputError } from './image-input-error';
import { readImageHead, type ImageHead } from './read-image-head';

/** What a negative scan's header says, judged usable: no pixel has been decoded yet. */
export interface NegativeHeader {
  format: ImageHead['format'];
  width: number;
  height: number;
  /** Bits per sample as stored. */
  bitDepth: 8 | 16;
  /** Channels as stored, alpha included (3 or 4 for RGB). */
  channels: number;
  /** Things the operator should know that do not stop the read (8-bit source, dropped alpha...). */
  warnings: string[];
}

/**
 * Reads and judges a negative scan's header without decoding any pixel: libvips parses the file's header only.
 *
 * `maxPixels` (a positive integer, required) is the largest width × height accepted. Throws a TypeError for a bad
 * `maxPixels`, and `ImageInputError` with code `missing`, `empty`, `not-an-image`, `truncated` (no header that
 * parses), `too-many-pixels`, `unsupported-depth` or `not-colour`, with messages written for the person who sent it.
 *
 * @example
 *   const { width, height, bitDepth } = await readNegativeHeader('roll-12/frame-03.tif', { maxPixels: 120e6 });
 */
export async function readNegativeHeader(
  path: string,
  options: { maxPixels: number },
): Promise<NegativeHeader> {
  const { maxPixels } = options;
  if (!Number.isInteger(maxPixels) || maxPixels < 1) {
    throw new TypeError(
      `Expected positive integer for maxPixels but received ${maxPixels} of type ${typeof maxPixels}`,
    );
  }
  const { format } = await readImageHead(path);
  let meta: Metadata;
  try {
    meta = await sharp(path, { limitInputPixels: false }).metadata();
  } catch (cause) {
    throw damagedImageError(format, cause);
  }
  const { width, height } = meta;
  if (!width || !height) throw damagedImageError(format, new Error('header has no size'));
  if (width * height > maxPixels) {
    throw new ImageInputError(
      'too-many-pixels',
      `The image is ${width} × ${height} pixels (${formatMegapixels(width * height)}), more than the ${formatMegapixels(maxPixels)} allowed.`,
    );
  }

  const warnings: string[] = [];
  let bitDepth: 8 | 16;
  if (meta.depth === 'ushort') {
    bitDepth = 16;
  } else if (meta.depth === 'uchar') {
    bitDepth = 8;
    warnings.push(
      'The scan has 8 bits per channel; 16-bit scans keep more detail in the dense parts of the negative.',
    );
  } else {
    throw new ImageInputError(
      'unsupported-depth',
      `The image stores samples as ${meta.depth ?? 'an unknown type'}; only 8- and 16-bit integer samples are supported.`,
    );
  }
  if (meta.space === 'cmyk') {
    throw new ImageInputError('not-colour', 'The image is CMYK; a negative scan must be RGB.');
  }
  const colourChannels = meta.hasAlpha ? meta.channels - 1 : meta.channels;
  if (colourChannels < 3) {
    throw new ImageInputError(
      'not-colour',
      'The scan is greyscale; a colour negative must be scanned in RGB so the film base and each dye layer can be measured.',
    );
  }
  if (meta.hasAlpha) warnings.push('The alpha channel was dropped.');
  if (meta.icc)
    warnings.push(
      'The embedded ICC profile was ignored; the scanner profile describes how counts are encoded.',
    );
  return { format, width, height, bitDepth, channels: meta.channels, warnings };
}

function formatMegapixels(pixels: number): string {
  return `${(pixels / 1e6).toFixed(1)} MP`;
}
