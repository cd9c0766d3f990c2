import { z } from 'zod';
import { outputFormatSchema } from './order';
import { adjustmentsSchema, measuredBaseSchema, pixelRegionSchema } from './roll';

/** Where a frame stands in batch inversion. */
export const frameStatuses = ['queued', 'inverting', 'done', 'failed'] as const;
export const frameStatusSchema = z.enum(frameStatuses);
export type FrameStatus = z.infer<typeof frameStatusSchema>;

/**
 * Quality-control flags a rendered frame may carry, for an operator to check:
 * - `roll-base-used`: no usable base in the frame; the roll's base was used instead
 * - `no-base`: no usable base in the frame nor on the roll; the frame is not rendered
 * - `clipped-highlights`: more of the positive is at full white than `qcThresholds.clippedFraction`
 * - `thin-negative`: underexposed, the frame's mean density above base is below `qcThresholds.thinDensity`
 * - `dense-negative`: overexposed, the mean density above base is above `qcThresholds.denseDensity`
 */
export const qcFlags = [
  'roll-base-used',
  'no-base',
  'clipped-highlights',
  'thin-negative',
  'dense-negative',
] as const;
export const qcFlagSchema = z.enum(qcFlags);
export type QcFlag = z.infer<typeof qcFlagSchema>;

/** The thresholds behind the QC flags. */
export const qcThresholds = {
  // 1 % of the pixels at full white reads as visibly blown highlights: common practice of the trade, from memory
  clippedFraction: 0.01,
  // a mean density above base under 0.3 is a very thin negative (2+ stops under at γ 0.6): from memory
  thinDensity: 0.3,
  // a mean density above base over 1.5 is a very dense negative (3+ stops over at γ 0.6): from memory
  denseDensity: 1.5,
} as const;

/** Which base a frame is inverted against: its own, found automatically or in a drawn rectangle. */
export const frameBaseSchema = z.object({
  mode: z.enum(['auto', 'region']),
  region: pixelRegionSchema.nullable(),
  /** Base actually used by the last render and where it came from. */
  source: z.enum(['frame', 'region', 'roll']).nullable(),
  measured: measuredBaseSchema.nullable(),
});
export type FrameBase = z.infer<typeof frameBaseSchema>;

/** A frame (one negative scan) as the API returns it. */
export const frameSchema = z.object({
  id: z.number().int().positive(),
  rollId: z.number().int().positive(),
  index: z.number().int().positive(),
  fileName: z.string(),
  width: z.number().int().positive(),
  height: z.number().int().positive(),
  bitDepth: z.union([z.literal(8), z.literal(16)]),
  status: frameStatusSchema,
  qcFlags: z.array(qcFlagSchema),
  base: frameBaseSchema,
  adjustments: adjustmentsSchema,
  attempts: z.number().int().min(0),
  error: z.string().nullable(),
  warnings: z.array(z.string()),
  /** Formats whose full-size output is ready. */
  outputs: z.array(outputFormatSchema),
  renderedAt: z.string().nullable(),
  createdAt: z.string(),
});
export type Frame = z.infer<typeof frameSchema>;

/** Sets a frame's base: automatic, or a rectangle drawn over unexposed film. */
export const frameBaseRequestSchema = z.discriminatedUnion('mode', [
  z.strictObject({ mode: z.literal('auto') }),
  z.strictObject({ mode: z.literal('region'), region: pixelRegionSchema }),
]);
export type FrameBaseRequest = z.infer<typeof frameBaseRequestSchema>;

export const frameOutputQuerySchema = z.strictObject({ format: outputFormatSchema.default('jpeg') });
export type FrameOutputQuery = z.infer<typeof frameOutputQuerySchema>;

// 4096 × 4096 pixels fill any screen at 1:1 and encode in well under a second: our choice
export const MAX_OUTPUT_REGION_PIXELS = 4096 * 4096;

const wholePixels = (least: number) =>
  z.coerce.number('Give a whole number of pixels').int('Give a whole number of pixels').min(least);

/**
 * A rectangle of a frame's full-size positive at 1:1, in its pixels (top-left origin), and the image format to
 * send it in: PNG (lossless, 8 bits sRGB) or JPEG.
 */
export const frameOutputRegionQuerySchema = z
  .strictObject({
    x: wholePixels(0),
    y: wholePixels(0),
    width: wholePixels(1),
    height: wholePixels(1),
    format: z.enum(['png', 'jpeg']).default('png'),
  })
  .refine((r) => r.width * r.height <= MAX_OUTPUT_REGION_PIXELS, {
    path: ['width'],
    message: 'Ask for at most 4096 × 4096 pixels at a time',
  });
export type FrameOutputRegionQuery = z.infer<typeof frameOutputRegionQuerySchema>;

/** Header names of a region reply: the size of the whole positive the region was cut from. */
export const frameOutputRegionHeaders = {
  width: 'X-Positive-Width',
  height: 'X-Positive-Height',
} as const;

/** One file of an upload that was kept, with the frame made from it. */
export const acceptedUploadSchema = z.object({
  fileName: z.string(),
  frameId: z.number().int().positive(),
  index: z.number().int().positive(),
  /** True when the same bytes were already in the store (they are stored once). */
  duplicate: z.boolean(),
  warnings: z.array(z.string()),
});
export type AcceptedUpload = z.infer<typeof acceptedUploadSchema>;

/** One file of an upload that was refused, and why; it left nothing behind. */
export const rejectedUploadSchema = z.object({
  fileName: z.string(),
  code: z.string(),
  reason: z.string(),
});
export type RejectedUpload = z.infer<typeof rejectedUploadSchema>;

/** The answer to an upload: each file accepted or rejected on its own. */
export const uploadResultSchema = z.object({
  accepted: z.array(acceptedUploadSchema),
  rejected: z.array(rejectedUploadSchema),
});
export type UploadResult = z.infer<typeof uploadResultSchema>;
