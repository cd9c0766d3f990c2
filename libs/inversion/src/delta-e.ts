import { differenceCiede2000 } from 'culori';
import type { Rgb } from './srgb';

const ciede2000 = differenceCiede2000();

/**
 * CIEDE2000 colour difference of two D65 L*a*b* colours (via culori, checked against Sharma 2005).
 * @example deltaE2000([50, 2.6772, -79.7751], [50, 0, -82.7485]) // 2.0425
 */
export function deltaE2000(lab1: Rgb, lab2: Rgb): number {
  return ciede2000(
    { mode: 'lab65', l: lab1[0], a: lab1[1], b: lab1[2] },
    { mode: 'lab65', l: lab2[0], a: lab2[1], b: lab2[2] },
  );
}
