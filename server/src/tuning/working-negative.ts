import type { RgbImage } from '@clearbase/inversion';

/**
 * A negative reduced by a whole factor so its long edge is at most `longEdge`: each output pixel is the mean of a
 * k×k block of counts (a box filter; means of linear counts are the light the block let through).
 * @example downsampleNegative({ width: 6000, height: 4000, data }, 1500) // 1500 × 1000
 */
export function downsampleNegative(image: RgbImage, longEdge: number): RgbImage {
  const k = Math.max(1, Math.ceil(Math.max(image.width, image.height) / longEdge));
  if (k === 1) return image;
  const width = Math.floor(image.width / k);
  const height = Math.floor(image.height / k);
  const data = new Uint16Array(width * height * 3);
  const sum = new Float64Array(width * 3);
  const area = k * k;
  for (let y = 0; y < height; y++) {
    sum.fill(0);
    for (let dy = 0; dy < k; dy++) {
      const row = (y * k + dy) * image.width * 3;
      for (let x = 0; x < width; x++) {
        const o = x * 3;
        let i = row + x * k * 3;
        for (let dx = 0; dx < k; dx++, i += 3) {
          sum[o]! += image.data[i]!;
          sum[o + 1]! += image.data[i + 1]!;
          sum[o + 2]! += image.data[i + 2]!;
        }
      }
    }
    const out = y * width * 3;
    for (let o = 0; o < width * 3; o++) data[out + o] = Math.round(sum[o]! / area);
  }
  return { width, height, data };
}
