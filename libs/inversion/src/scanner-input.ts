import type { ScannerProfile } from '@clearbase/contracts';
import { srgbDecode, srgbEncode } from './srgb';

/** Largest 16-bit count. */
export const FULL_SCALE_16 = 65535;

/**
 * A linear scanner with no black level and unit gains.
 * @example linearise(32768 / 65535, LINEAR_SCANNER, 0) // ≈ 0.5
 */
export const LINEAR_SCANNER: ScannerProfile = {
  name: 'Linear',
  encoding: 'linear',
  gamma: 1,
  blackLevel: [0, 0, 0],
  gains: [1, 1, 1],
};

/**
 * Linear transmitted light L_c of one scanner value (0..1 of full scale): decode, subtract black, apply gain.
 * @example linearise(0.5, { ...LINEAR_SCANNER, encoding: 'srgb' }, 0) // 0.2140411405
 */
export function linearise(value: number, scanner: ScannerProfile, channel: 0 | 1 | 2): number {
  const decoded =
    scanner.encoding === 'srgb'
      ? srgbDecode(value)
      : scanner.encoding === 'gamma'
        ? value ** scanner.gamma
        : value;
  return (decoded - scanner.blackLevel[channel]) * scanner.gains[channel];
}

/**
 * Scanner value (0..1 of full scale) of linear light, the inverse of `linearise`, clipped to 0..1.
 * @example encodeScannerValue(0.5, LINEAR_SCANNER, 0) // 0.5
 */
export function encodeScannerValue(light: number, scanner: ScannerProfile, channel: 0 | 1 | 2): number {
  const decoded = Math.min(1, Math.max(0, light / scanner.gains[channel] + scanner.blackLevel[channel]));
  return scanner.encoding === 'srgb'
    ? srgbEncode(decoded)
    : scanner.encoding === 'gamma'
      ? decoded ** (1 / scanner.gamma)
      : decoded;
}
