/**
 * Metered times up to this many seconds need no reciprocity correction: the law holds for ordinary exposures and
 * correction usually starts around one second (common practice of the trade, from memory).
 */
export const reciprocityThresholdSeconds = 1;

/**
 * The exposure time that makes up for reciprocity failure, by Schwarzschild's law in its practical form:
 * t_corrected = t_metered^p, with t in seconds and p the stock's exponent (about 1.3 for many films). Times at or
 * below {@link reciprocityThresholdSeconds} come back unchanged.
 *
 * Throws a RangeError for a time that is not a positive finite number or an exponent below 1.
 *
 * @example
 * correctedExposureSeconds(10, 1.3); // 19.95…
 * correctedExposureSeconds(0.5, 1.3); // 0.5
 */
export function correctedExposureSeconds(meteredSeconds: number, exponent: number): number {
  if (!Number.isFinite(meteredSeconds) || meteredSeconds <= 0) {
    throw new RangeError(
      `Expected a positive number of seconds for meteredSeconds but received ${meteredSeconds} of type ${typeof meteredSeconds}`,
    );
  }
  if (!Number.isFinite(exponent) || exponent < 1) {
    throw new RangeError(
      `Expected a number of 1 or more for exponent but received ${exponent} of type ${typeof exponent}`,
    );
  }
  if (meteredSeconds <= reciprocityThresholdSeconds) return meteredSeconds;
  return meteredSeconds ** exponent;
}
