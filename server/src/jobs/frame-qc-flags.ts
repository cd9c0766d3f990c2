import { qcThresholds, type QcFlag, type ScannerProfile } from '@clearbase/contracts';
import { DEFAULT_CLIP_FRACTION, FULL_SCALE_16, linearise, type RgbImage } from '@clearbase/inversion';

// every 4th pixel each way is plenty for a mean and a fraction (our choice, as measureFrameLevels does)
const sampleStep = 4;

/**
 * QC flags measured on a rendered frame: clipped highlights in the positive (16-bit, all channels at full scale),
 * and a very thin or very dense negative from the mean green density above base of its film pixels (bare light
 * left out). Thresholds are `qcThresholds`.
 */
export function frameQcFlags(
  negative: RgbImage,
  positive16: Uint16Array,
  scanner: ScannerProfile,
  baseGreen: number,
): QcFlag[] {
  const flags: QcFlag[] = [];
  let clipped = 0;
  let sampled = 0;
  let densitySum = 0;
  let film = 0;
  const bareLight = DEFAULT_CLIP_FRACTION * FULL_SCALE_16;
  for (let y = 0; y < negative.height; y += sampleStep) {
    for (let x = 0; x < negative.width; x += sampleStep) {
      const i = (y * negative.width + x) * 3;
      sampled++;
      if (
        positive16[i] === FULL_SCALE_16 &&
        positive16[i + 1] === FULL_SCALE_16 &&
        positive16[i + 2] === FULL_SCALE_16
      )
        clipped++;
      const g = negative.data[i + 1]!;
      if (g >= bareLight || negative.data[i]! >= bareLight || negative.data[i + 2]! >= bareLight) continue;
      const light = linearise(g / FULL_SCALE_16, scanner, 1);
      if (!(light > 0)) continue;
      densitySum += Math.log10(baseGreen / light);
      film++;
    }
  }
  if (sampled > 0 && clipped / sampled > qcThresholds.clippedFraction) flags.push('clipped-highlights');
  if (film > 0) {
    const meanDensity = densitySum / film;
    if (meanDensity < qcThresholds.thinDensity) flags.push('thin-negative');
    if (meanDensity > qcThresholds.denseDensity) flags.push('dense-negative');
  }
  return flags;
}
