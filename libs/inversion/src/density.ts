/** Smallest transmittance used before taking a logarithm: density 6, far past any film (from memory). */
export const MIN_TRANSMITTANCE = 1e-6;

/**
 * Transmission density of a transmittance, D = −log10 T (ISO 5-1 notation).
 * @example densityFromTransmittance(0.1) // 1.00
 */
export function densityFromTransmittance(t: number): number {
  return -Math.log10(Math.max(t, MIN_TRANSMITTANCE));
}

/**
 * Transmittance of a density, T = 10^−D.
 * @example transmittanceFromDensity(1) // 0.1
 */
export function transmittanceFromDensity(d: number): number {
  return 10 ** -d;
}

/**
 * Density above film base, D = log10(B / L), both in linear light of the same scale.
 * @example densityAboveBase(0.08, 0.8) // 1.00
 */
export function densityAboveBase(light: number, base: number): number {
  return Math.log10(Math.max(base, MIN_TRANSMITTANCE) / Math.max(light, MIN_TRANSMITTANCE));
}
