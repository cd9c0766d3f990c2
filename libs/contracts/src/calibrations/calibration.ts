import { z } from 'zod';
import { pixelRegionSchema } from '../orders/roll';
import { balanceSchema, curvePointSchema } from '../profiles/profile-document';

const positiveId = z.int('Expected a whole id').positive('Expected a positive id');
const pixel = z
  .number('Expected a number of pixels')
  .finite()
  .min(0, 'Expected a pixel position of at least 0');
const rgb = z.tuple([z.number(), z.number(), z.number()]);

/** A point on a frame, pixels from its top-left corner: [x, y]. */
export const framePointSchema = z.tuple([pixel, pixel]);
export type FramePoint = z.infer<typeof framePointSchema>;

/**
 * One grey card frame of the bracket: its exposure in stops from the metered exposure (−10 … +10 spans any
 * bracket a camera gives: common practice of the trade, from memory), and optionally its own grey rectangle.
 */
export const bracketFrameRequestSchema = z.strictObject({
  stops: z
    .number('Expected the frame’s exposure in stops, e.g. -1 or 0.33')
    .finite()
    .min(-10, 'Expected stops between -10 and 10')
    .max(10, 'Expected stops between -10 and 10'),
  greyRegion: pixelRegionSchema.nullable().default(null),
});
export type BracketFrameRequest = z.infer<typeof bracketFrameRequestSchema>;

/**
 * The JSON part of a new calibration (multipart field `calibration`), sent beside the files: `bracket` (one file
 * per entry of `bracket`, in the same order), `chart` and optionally `leader`. The chart is marked by its four
 * corners (by patch 1, 6, 24, 19 in that order) or by an axis-aligned region; the grey rectangle applies to every
 * grey frame unless the frame carries its own. The base is sampled on the leader (whole frame or `baseRegion`), or
 * in `baseRegion` / found automatically on each frame without one.
 */
export const createCalibrationRequestSchema = z
  .strictObject({
    stockId: positiveId,
    scannerId: positiveId.nullable().default(null),
    bracket: z
      .array(bracketFrameRequestSchema)
      .min(2, 'Expected at least 2 grey frames (5 or more for a sound fit)')
      .max(100, 'Expected at most 100 grey frames'),
    greyRegion: pixelRegionSchema,
    chartCorners: z
      .tuple([framePointSchema, framePointSchema, framePointSchema, framePointSchema])
      .optional(),
    chartRegion: pixelRegionSchema.optional(),
    baseRegion: pixelRegionSchema.nullable().default(null),
  })
  .superRefine((value, ctx) => {
    if (!value.chartCorners === !value.chartRegion)
      ctx.addIssue({
        code: 'custom',
        path: ['chartCorners'],
        message: 'Mark the chart by its four corners or by a region, one of the two',
      });
  });
export type CreateCalibrationRequest = z.infer<typeof createCalibrationRequestSchema>;

/** One uploaded frame of a calibration, as stored. `n` numbers them from 1: the bracket, then chart, then leader. */
export const calibrationFrameSchema = z.object({
  n: z.number().int().positive(),
  role: z.enum(['bracket', 'chart', 'leader']),
  fileId: z.number().int().positive(),
  fileName: z.string(),
  width: z.number().int().positive(),
  height: z.number().int().positive(),
  bitDepth: z.union([z.literal(8), z.literal(16)]),
  /** Bracket frames only. */
  stops: z.number().nullable(),
  /** The rectangle sampled on a bracket frame. */
  greyRegion: pixelRegionSchema.nullable(),
});
export type CalibrationFrame = z.infer<typeof calibrationFrameSchema>;

/** What the operator gave: the frames and the marks. */
export const calibrationInputsSchema = z.object({
  frames: z.array(calibrationFrameSchema),
  greyRegion: pixelRegionSchema,
  chartCorners: z.array(framePointSchema).nullable(),
  chartRegion: pixelRegionSchema.nullable(),
  baseRegion: pixelRegionSchema.nullable(),
});
export type CalibrationInputs = z.infer<typeof calibrationInputsSchema>;

const curvePositionSchema = z.object({ logExposure: z.number(), density: z.number() }).nullable();

/** A fitted characteristic curve of one channel; log exposures relative to the metered grey (0). */
export const fittedCurveSchema = z.object({
  points: z.array(curvePointSchema),
  gamma: z.number(),
  adjusted: z.boolean(),
  residualRms: z.number(),
  straightPart: z.object({
    from: z.number(),
    to: z.number(),
    intercept: z.number(),
    residualRms: z.number(),
    points: z.number(),
  }),
  toe: curvePositionSchema,
  shoulder: curvePositionSchema,
});
export type FittedCurve = z.infer<typeof fittedCurveSchema>;

const summarySchema = z.object({ mean: z.number().nullable(), max: z.number().nullable() });
const matrixSchema = z.tuple([rgb, rgb, rgb]);

/** One chart frame's figures: its exposure found from its neutral row, the patches used and ΔE00 with the profile. */
export const chartFrameDeltaESchema = z.object({
  exposureStops: z.number(),
  labelledStops: z.number().nullable(),
  patchesUsed: z.number().int().min(0),
  after: summarySchema,
});
export type ChartFrameDeltaE = z.infer<typeof chartFrameDeltaESchema>;

const channelsOf = <T extends z.ZodType>(s: T) => z.object({ red: s, green: s, blue: s });

/** One chart patch's colour accuracy in reference rendering, with sRGB swatches of reference and result. */
export const patchDeltaESchema = z.object({
  index: z.number().int(),
  name: z.string(),
  /** L*a*b* (D65). */
  reference: rgb,
  after: rgb.nullable(),
  deltaEBefore: z.number().nullable(),
  deltaEAfter: z.number().nullable(),
  /** L*a*b* (D65) reproduced by matrices fitted without this patch (leave-one-patch-out); null when not usable or in older calibrations. */
  crossValidated: rgb.nullable(),
  deltaECrossValidated: z.number().nullable(),
  inGamut: z.boolean(),
  measured: z.boolean(),
  /** #rrggbb of the reference and of the result (clipped to sRGB). */
  referenceHex: z.string(),
  afterHex: z.string().nullable(),
});
export type PatchDeltaE = z.infer<typeof patchDeltaESchema>;

/** Everything a calibration fitted. */
export const calibrationFitSchema = z.object({
  /** γ of the profile's curves, red, green, blue. */
  gamma: rgb,
  /** The profile's curves (after crosstalk). */
  curves: channelsOf(fittedCurveSchema),
  /** Each usable grey frame's densities above base after crosstalk, for plotting beside the curves. */
  greyPoints: z.array(z.object({ stops: z.number(), logExposure: z.number(), densities: rgb })),
  speedPoint: z.object({
    channels: rgb,
    extrapolated: z.tuple([z.boolean(), z.boolean(), z.boolean()]),
    slowerLayer: z.union([z.literal(0), z.literal(2)]),
    logExposure: z.number(),
    offsetStops: z.number(),
    ei: z.number(),
  }),
  ei: z.number(),
  iso: z.number(),
  balance: z.object({
    frames: z.array(z.object({ stops: z.number(), balance: balanceSchema })),
    mean: balanceSchema,
  }),
  spread: z.object({ range: balanceSchema, standardDeviation: balanceSchema, largestRange: z.number() }),
  crosstalk: matrixSchema,
  /** Film exposures to linear sRGB, rows summing to 1; null in calibrations made before it was fitted. */
  exposureMatrix: matrixSchema.nullable(),
  chartExposureStops: z.number(),
  deltaE: z.object({
    patches: z.array(patchDeltaESchema),
    before: summarySchema,
    /** Training figures: the profile against the patches it was fitted to. */
    after: summarySchema,
    /** Each patch predicted by a fit without it; null in older calibrations. */
    crossValidated: summarySchema.nullable(),
    /** Largest |Δa*| and |Δb*| over the neutral row with the profile; null in older calibrations. */
    neutral: z.object({ a: z.number(), b: z.number() }).nullable(),
    /** Every chart frame, the metered one first; empty in older calibrations. */
    frames: z.array(chartFrameDeltaESchema),
    /** The cross-validated mean lies more than the limit above the training mean: the matrices memorise the chart. */
    memorisedChart: z.boolean(),
  }),
  base: z.object({ rgb, source: z.enum(['leader', 'frames']) }),
  usedFrames: z.array(z.number().int()),
  /** Seconds the fit took on the server, reading included. */
  seconds: z.number(),
});
export type CalibrationFit = z.infer<typeof calibrationFitSchema>;

/** RMS residuals, D: of each measured curve, each profile curve, and each row of the crosstalk fit. */
export const calibrationResidualsSchema = z.object({
  measuredCurves: rgb,
  profileCurves: rgb,
  straightParts: rgb,
  crosstalk: rgb,
});
export type CalibrationResiduals = z.infer<typeof calibrationResidualsSchema>;

export const calibrationWarningSchema = z.object({
  code: z.string(),
  severity: z.enum(['warning', 'notice']),
  message: z.string(),
  frame: z.number().int().optional(),
  channel: z.enum(['red', 'green', 'blue']).optional(),
  patch: z.number().int().optional(),
});
export type CalibrationWarning = z.infer<typeof calibrationWarningSchema>;

/** A calibration as lists show it. */
export const calibrationSummarySchema = z.object({
  id: z.number().int().positive(),
  stockId: z.number().int().positive(),
  stockName: z.string(),
  scannerId: z.number().int().positive().nullable(),
  profileId: z.number().int().positive().nullable(),
  profileVersionId: z.number().int().positive().nullable(),
  gamma: rgb,
  ei: z.number(),
  meanDeltaE: z.number().nullable(),
  warningCount: z.number().int().min(0),
  createdAt: z.string(),
  createdBy: z.number().int().nullable(),
  createdByName: z.string().nullable(),
});
export type CalibrationSummary = z.infer<typeof calibrationSummarySchema>;

/** A calibration with its inputs, fitted values, residuals and warnings. */
export const calibrationSchema = calibrationSummarySchema.extend({
  inputs: calibrationInputsSchema,
  fit: calibrationFitSchema,
  residuals: calibrationResidualsSchema,
  warnings: z.array(calibrationWarningSchema),
});
export type Calibration = z.infer<typeof calibrationSchema>;

export const calibrationListResponseSchema = z.object({ calibrations: z.array(calibrationSummarySchema) });
export type CalibrationListResponse = z.infer<typeof calibrationListResponseSchema>;

/** Filters of the calibration list. */
export const calibrationListQuerySchema = z.strictObject({
  stockId: z.coerce.number().int().positive().optional(),
  profileVersionId: z.coerce.number().int().positive().optional(),
});
export type CalibrationListQuery = z.infer<typeof calibrationListQuerySchema>;

/** A frame of a calibration by its number. */
export const calibrationFrameParamsSchema = z.object({
  id: z.coerce.number().int().positive('Expected a positive calibration id'),
  n: z.coerce.number().int().positive('Expected a frame number from 1'),
});
