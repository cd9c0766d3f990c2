import type { PixelRegion } from '@clearbase/contracts';
import type { FieldError } from '../errors/app-error';
import { AppError } from '../errors/app-error';

/** Throws a 422 naming the field when the rectangle does not lie inside a width × height scan. */
export function assertRegionInside(region: PixelRegion, width: number, height: number, path: string): void {
  const errors: FieldError[] = [];
  if (region.x + region.width > width)
    errors.push({
      path: `${path}.width`,
      message: `x + width is ${region.x + region.width}, past the scan's width of ${width} pixels`,
    });
  if (region.y + region.height > height)
    errors.push({
      path: `${path}.height`,
      message: `y + height is ${region.y + region.height}, past the scan's height of ${height} pixels`,
    });
  if (errors.length) {
    throw new AppError(
      'region-outside-frame',
      422,
      `The rectangle must lie inside the ${width} × ${height} scan.`,
      errors,
    );
  }
}
