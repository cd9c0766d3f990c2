import type { Balance } from '@clearbase/contracts';
import type { Rgb } from './srgb';

/** One printer point in log exposure (common practice of the trade, from memory). */
export const LOG_EXPOSURE_PER_POINT = 0.025;
/** One stop in log exposure: log10 2 (a factor of 2 in exposure). */
export const LOG_EXPOSURE_PER_STOP = Math.log10(2);

/**
 * Log exposure of a number of printer points.
 * @example pointsToLogExposure(12) // 0.30
 */
export function pointsToLogExposure(points: number): number {
  return points * LOG_EXPOSURE_PER_POINT;
}

/**
 * Log exposure of a number of stops.
 * @example stopsToLogExposure(1) // 0.30103
 */
export function stopsToLogExposure(stops: number): number {
  return stops * LOG_EXPOSURE_PER_STOP;
}

/** A balance of zero points. */
export const ZERO_BALANCE: Balance = { cyanRed: 0, magentaGreen: 0, yellowBlue: 0 };

/**
 * Sums balances (profile + roll + frame).
 * @example addBalances({ cyanRed: 1, magentaGreen: 0, yellowBlue: 0 }, { cyanRed: 2, magentaGreen: 1, yellowBlue: 0 }) // { cyanRed: 3, magentaGreen: 1, yellowBlue: 0 }
 */
export function addBalances(...balances: Balance[]): Balance {
  return balances.reduce(
    (s, b) => ({
      cyanRed: s.cyanRed + b.cyanRed,
      magentaGreen: s.magentaGreen + b.magentaGreen,
      yellowBlue: s.yellowBlue + b.yellowBlue,
    }),
    ZERO_BALANCE,
  );
}

/**
 * Per-channel log exposure offsets (red, green, blue) of a balance. Sign convention: +cyanRed adds
 * exposure to the red channel, so the positive gets more red; −cyanRed makes it more cyan. Likewise
 * +magentaGreen → greener, +yellowBlue → bluer.
 * @example balanceToLogExposure({ cyanRed: 12, magentaGreen: 0, yellowBlue: -4 }) // [0.3, 0, -0.1]
 */
export function balanceToLogExposure(balance: Balance): Rgb {
  return [
    pointsToLogExposure(balance.cyanRed),
    pointsToLogExposure(balance.magentaGreen),
    pointsToLogExposure(balance.yellowBlue),
  ];
}
