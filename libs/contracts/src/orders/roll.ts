import { z } from 'zod';
import { eiRange, pushPullStops } from '../values/film-speed';
import { rollStatuses } from '../values/order-enums';
import { frameFormatMaxLength } from '../values/text-limits';

const positiveId = z.int('Expected a whole id').positive('Expected a positive id');

/** A rectangle in pixels of the negative scan, top-left origin. */
export const pixelRegionSchema = z.strictObject({
  x: z.int('Expected whole pixels').min(0),
  y: z.int('Expected whole pixels').min(0),
  width: z.int('Expected whole pixels').min(1, 'Expected a width of at least 1 pixel'),
  height: z.int('Expected whole pixels').min(1, 'Expected a height of at least 1 pixel'),
});
export type PixelRegion = z.infer<typeof pixelRegionSchema>;

/** Steps of the exposure and point controls per stop: a sixth of a stop, common practice of the trade, from memory. */
export const STOP_STEPS = 6;

/** True when `stops` is a whole number of 1/6 stops (within rounding of the JSON number). */
export function isSixthOfStop(stops: number): boolean {
  // 1e-9 of a step absorbs the binary rounding of k/6 written as decimal JSON: our choice
  return Math.abs(stops * STOP_STEPS - Math.round(stops * STOP_STEPS)) < 1e-9;
}

/**
 * A shift of a frame's black or white point in stops of log exposure, in 1/6-stop steps.
 * ±3 stops moves a point past any print's shadows or highlights: common practice of the trade, from memory.
 */
const pointShiftStops = z
  .number()
  .min(-3, 'Move the point by at most 3 stops')
  .max(3, 'Move the point by at most 3 stops')
  .refine(isSixthOfStop, 'Use steps of 1/6 stop')
  .default(0);

// the controls step casts in whole printer points: common practice of the trade, from memory
const wholePoints = z.number().refine(Number.isInteger, 'Use whole printer points');

/**
 * A roll's or a frame's balance in whole printer points. A profile's own balance (in its document) may be
 * fractional; what an operator sets on a roll or frame is whole, as the controls and the neutral picker step.
 */
export const wholePointsBalanceSchema = z.strictObject({
  cyanRed: wholePoints,
  magentaGreen: wholePoints,
  yellowBlue: wholePoints,
});

/**
 * Tuning of a roll or of one frame. Balance in whole printer points on the positive's axes (a frame's adds to its
 * roll's, which adds to the profile's); exposure in 1/6 stops (they add); contrast replaces the profile's when set.
 * `blackPointStops` / `whitePointStops` move the log exposures that print as black and as white (from the frame's or
 * the roll's levels), in stops: positive moves a point to more exposure, so deeper blacks for the black point and
 * dimmer highlights for the white point; a roll's and a frame's shifts add.
 */
export const adjustmentsSchema = z.strictObject({
  balance: wholePointsBalanceSchema.default({ cyanRed: 0, magentaGreen: 0, yellowBlue: 0 }),
  // ±5 stops spans any correction a printed negative takes: common practice of the trade, from memory
  exposureStops: z.number().min(-5).max(5).refine(isSixthOfStop, 'Use steps of 1/6 stop').default(0),
  contrast: z.number().positive().max(4).nullable().default(null),
  blackPointStops: pointShiftStops,
  whitePointStops: pointShiftStops,
});
export type Adjustments = z.infer<typeof adjustmentsSchema>;

/** Adjustments that change nothing. */
export const neutralAdjustments: Adjustments = {
  balance: { cyanRed: 0, magentaGreen: 0, yellowBlue: 0 },
  exposureStops: 0,
  contrast: null,
  blackPointStops: 0,
  whitePointStops: 0,
};

/**
 * Adjustments read back from their stored JSON: a field added since they were saved (the black and white point
 * shifts) takes its neutral value.
 * @example readStoredAdjustments('{"balance":{"cyanRed":2,"magentaGreen":0,"yellowBlue":0},"exposureStops":0,"contrast":null}').blackPointStops // 0
 */
export function readStoredAdjustments(json: string): Adjustments {
  return { ...neutralAdjustments, ...(JSON.parse(json) as Partial<Adjustments>) };
}

/** Where a roll stands on the way from scans to finished positives. */
export const rollStatusSchema = z.enum(rollStatuses);

/** A measured film base: linear light per channel (0..1 of full scale), the region it came from and how sure. */
export const measuredBaseSchema = z.object({
  rgb: z.tuple([z.number(), z.number(), z.number()]),
  region: pixelRegionSchema.nullable(),
  confidence: z.number().min(0).max(1),
});
export type MeasuredBase = z.infer<typeof measuredBaseSchema>;

/** A roll's base: found automatically (median of its frames) or sampled from a rectangle on one frame (the leader). */
export const rollBaseSchema = z.object({
  mode: z.enum(['auto', 'region']),
  frameId: z.number().int().positive().nullable(),
  region: pixelRegionSchema.nullable(),
  measured: measuredBaseSchema.nullable(),
});
export type RollBase = z.infer<typeof rollBaseSchema>;

/** A roll as the API returns it (without frames). */
export const rollSchema = z.object({
  id: z.number().int().positive(),
  orderId: z.number().int().positive(),
  stockId: z.number().int().positive(),
  stockName: z.string(),
  ei: z.number().int().positive(),
  pushPull: z.number(),
  format: z.string(),
  scannerId: z.number().int().positive().nullable(),
  profileVersionId: z.number().int().positive(),
  profileVersion: z.number().int().positive(),
  status: rollStatusSchema,
  base: rollBaseSchema,
  adjustments: adjustmentsSchema,
  frameCount: z.number().int().min(0),
  createdAt: z.string(),
  updatedAt: z.string(),
});
export type Roll = z.infer<typeof rollSchema>;

/** Adds a roll to an order; the stock's current published profile version is pinned. */
export const createRollRequestSchema = z.strictObject({
  stockId: positiveId,
  ei: z.int('Expected a whole EI').min(eiRange.min).max(eiRange.max),
  pushPull: z
    .number()
    .min(pushPullStops.min)
    .max(pushPullStops.max)
    .refine((v) => Number.isInteger(v / pushPullStops.step), 'Expected push or pull in half stops')
    .default(0),
  format: z.string().trim().min(1, 'Name the frame format, e.g. 135-36').max(frameFormatMaxLength),
  scannerId: positiveId.nullable().default(null),
});
export type CreateRollRequest = z.infer<typeof createRollRequestSchema>;

/** Sets a roll's base: automatic, or a rectangle drawn on one of its frames (a leader or rebate). */
export const rollBaseRequestSchema = z.discriminatedUnion('mode', [
  z.strictObject({ mode: z.literal('auto') }),
  z.strictObject({ mode: z.literal('region'), frameId: positiveId, region: pixelRegionSchema }),
]);
export type RollBaseRequest = z.infer<typeof rollBaseRequestSchema>;

/**
 * Which frames an inversion job renders (those not done yet, or every frame again), and whose levels set exposure,
 * neutral balance and black and white points: each frame's own, the whole roll's together for consistency, or none
 * (`metered`: fixed at the profile's metered exposure for the roll's EI, with the profile's own balance and points).
 * The roll's and the frames' exposure stops apply in every case.
 */
export const invertRollRequestSchema = z.strictObject({
  frames: z.enum(['pending', 'all']).default('pending'),
  levels: z.enum(['frame', 'roll', 'metered']).default('frame'),
});
export type InvertRollRequest = z.infer<typeof invertRollRequestSchema>;
