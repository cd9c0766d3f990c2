import { calibrationPreviewHeaders } from '@clearbase/contracts';
import type { Response } from 'express';
import sharp from 'sharp';
import { damagedImageError } from '../imaging/damaged-image-error';
import { readNegativeHeader } from '../imaging/index';

/** Long edge of frame previews, pixels: enough to click a chart's corners on any screen (our choice). */
export const calibrationPreviewLongEdge = 2048;
// JPEG quality 85 for looking at a negative, not for delivery: common practice for web previews, from memory
const previewQuality = 85;

/**
 * Sends a JPEG preview of a negative with its levels stretched (a clear-base negative is low in contrast and the
 * chart's corners must be visible), and the scan's full size in headers so marks map back to its pixels. Throws
 * ImageInputError for a file that is not a scan the product reads.
 */
export async function sendCalibrationPreview(res: Response, path: string, maxPixels: number): Promise<void> {
  const header = await readNegativeHeader(path, { maxPixels });
  const bytes = await sharp(path)
    .resize(calibrationPreviewLongEdge, calibrationPreviewLongEdge, {
      fit: 'inside',
      withoutEnlargement: true,
    })
    .normalise()
    .toColourspace('srgb')
    .jpeg({ quality: previewQuality })
    .toBuffer()
    .catch((cause: unknown) => {
      // the header was sound, so what failed is the pixel data
      throw damagedImageError(header.format, cause);
    });
  res.set(calibrationPreviewHeaders.width, String(header.width));
  res.set(calibrationPreviewHeaders.height, String(header.height));
  res.set('Access-Control-Expose-Headers', Object.values(calibrationPreviewHeaders).join(', '));
  res.type('image/jpeg').send(bytes);
}
