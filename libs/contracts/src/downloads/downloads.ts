import { z } from 'zod';
import { orderBalanceSchema } from '../customers/payment';
import { outputFormatSchema } from '../orders/order';

/** A signed link to an order's finished scans, as the API hands it out. */
export const downloadLinkSchema = z.object({
  /** Absolute URL of the whole order as a zip; add `?frame=ID` for one frame. */
  url: z.string(),
  expiresAt: z.string(),
});
export type DownloadLink = z.infer<typeof downloadLinkSchema>;

/** `?frame=ID` on a download link: one frame instead of the whole order. */
export const downloadQuerySchema = z.strictObject({
  frame: z.coerce.number().int().positive('Expected a whole frame id').optional(),
});
export type DownloadQuery = z.infer<typeof downloadQuerySchema>;

export const downloadTokenParamsSchema = z.object({
  token: z.string().min(1).max(200),
});

/** One finished frame of an order's gallery. */
export const galleryFrameSchema = z.object({
  id: z.number().int().positive(),
  rollId: z.number().int().positive(),
  /** Position of the roll in the order, from 1. */
  rollNumber: z.number().int().positive(),
  index: z.number().int().min(0),
  fileName: z.string(),
  width: z.number().int().positive(),
  height: z.number().int().positive(),
  thumbnailUrl: z.string(),
  /** The 2048 px preview; null while the order's scans are not released to its customer. */
  previewUrl: z.string().nullable(),
  /** Full-size files, one per format made: `/api/frames/ID/output?format=…`; empty while not released. */
  downloads: z.array(z.object({ format: outputFormatSchema, url: z.string() })),
});
export type GalleryFrame = z.infer<typeof galleryFrameSchema>;

/** Whether the order's previews, full-size files and zip are released to its customer, and why not when not. */
export const fileReleaseSchema = z.object({
  fullSize: z.boolean(),
  reason: z.string().nullable(),
});
export type FileRelease = z.infer<typeof fileReleaseSchema>;

export const galleryResponseSchema = z.object({
  orderId: z.number().int().positive(),
  frames: z.array(galleryFrameSchema),
  /** For staff always released. */
  release: fileReleaseSchema,
  balance: orderBalanceSchema,
});
export type GalleryResponse = z.infer<typeof galleryResponseSchema>;

/** A roll that keeps an order from being marked ready, and why ("has no scans yet", "has 2 frames not approved"). */
export const rollNotApprovedSchema = z.object({
  rollId: z.number().int().positive(),
  /** Position of the roll in the order, from 1. */
  rollNumber: z.number().int().positive(),
  reason: z.string(),
});
export type RollNotApproved = z.infer<typeof rollNotApprovedSchema>;

/** GET /api/orders/:id/readiness: whether staff may mark the order ready now, and how long the mailed link works. */
export const orderReadinessSchema = z.object({
  ready: z.boolean(),
  /** Why not, when not: the order is closed or has no rolls. */
  blocker: z.string().nullable(),
  waiting: z.array(rollNotApprovedSchema),
  linkValidHours: z.number().int().positive(),
});
export type OrderReadiness = z.infer<typeof orderReadinessSchema>;
