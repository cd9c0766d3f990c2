import { z } from 'zod';

const rgb = z.tuple([z.number(), z.number(), z.number()]);
const positiveRgb = z.tuple([z.number().positive(), z.number().positive(), z.number().positive()]);

/**
 * The part of a stock profile document the command line needs: a straight-line characteristic
 * curve per channel, the dye crosstalk matrix and the neutral balance in printer points.
 */
export const stockProfileSchema = z.strictObject({
  stock: z.string().min(1),
  version: z.int().min(1).default(1),
  /** Slope of each channel's characteristic curve, density per log exposure. */
  gamma: positiveRgb,
  /** Row-major 3×3 dye crosstalk matrix on densities; identity when absent. */
  crosstalk: z.array(z.number()).length(9).optional(),
  /** Neutral balance of the stock in printer points, red, green, blue. */
  balancePoints: rgb.default([0, 0, 0]),
});
export type StockProfile = z.infer<typeof stockProfileSchema>;

/** How the scanner encodes transmitted light in its counts. */
export const scannerProfileSchema = z.strictObject({
  name: z.string().min(1),
  encoding: z.enum(['linear', 'srgb', 'gamma']).default('linear'),
  gamma: z.number().positive().default(2.2),
  /** Counts of a capped (dark) frame as a fraction of full scale. */
  blackLevel: z.number().min(0).max(0.5).default(0),
});
export type ScannerProfile = z.infer<typeof scannerProfileSchema>;

// Colour negative films have gamma around 0.5–0.7 (design notes; common practice of the trade).
export const NEUTRAL_STOCK: StockProfile = {
  stock: 'neutral',
  version: 1,
  gamma: [0.6, 0.6, 0.6],
  balancePoints: [0, 0, 0],
};
export const LINEAR_SCANNER: ScannerProfile = {
  name: 'linear',
  encoding: 'linear',
  gamma: 2.2,
  blackLevel: 0,
};
