import { ImageInputError } from './image-input-error';
import type { SniffedFormat } from './sniff-format';

const FORMAT_NAMES: Record<Exclude<SniffedFormat, 'unknown'>, string> = {
  tiff: 'TIFF',
  png: 'PNG',
  jpeg: 'JPEG',
};

/**
 * The `truncated` error for a file that starts like an image of `format` but whose header or pixel data do not decode.
 *
 * @example
 *   throw damagedImageError('tiff', sharpError);
 */
export function damagedImageError(
  format: Exclude<SniffedFormat, 'unknown'>,
  cause: unknown,
): ImageInputError {
  return new ImageInputError(
    'truncated',
    `The file starts like a ${FORMAT_NAMES[format]} image but its data is incomplete or damaged; it may have been cut off during copying or upload.`,
    { cause },
  );
}
