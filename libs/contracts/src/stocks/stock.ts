import { z } from 'zod';
import { isoRange } from '../values/film-speed';
import { scannerProfileSchema } from '../profiles/profile-document';

/** Development processes a stock can be made for. */
export const filmProcesses = ['C-41', 'E-6', 'black-and-white'] as const;
export const filmProcessSchema = z.enum(filmProcesses);
export type FilmProcess = z.infer<typeof filmProcessSchema>;

/** A film stock of the catalogue as the API returns it. */
export const stockSchema = z.object({
  id: z.number().int().positive(),
  name: z.string(),
  maker: z.string(),
  iso: z.number().int().positive(),
  process: filmProcessSchema,
  masked: z.boolean(),
  baseMaterial: z.string(),
  frameFormats: z.array(z.string()),
  notes: z.string(),
  /** The EI the lab recommends rating the stock at; null means its box speed. */
  recommendedEi: z.number().int().positive().nullable(),
  /** Stops of underexposure the stock still prints well from; null when not stated. */
  latitudeUnderStops: z.number().nonnegative().nullable(),
  /** Stops of overexposure the stock still prints well from; null when not stated. */
  latitudeOverStops: z.number().nonnegative().nullable(),
  pushPullNotes: z.string(),
  /** p of the reciprocity correction t_corrected = t_metered^p (seconds). */
  reciprocityExponent: z.number().positive(),
  /** Loading and handling advice, such as what a thin polyester base does in a camera. */
  handlingNotes: z.string(),
  createdAt: z.string(),
});
export type Stock = z.infer<typeof stockSchema>;

const filmSpeed = (what: string) =>
  z
    .int(`Expected a whole ${what}`)
    .min(isoRange.min, `Expected ${what} ${isoRange.min} or more`)
    .max(isoRange.max, `Expected ${what} at most ${isoRange.max}`);
// 10 stops either way is beyond any negative film's latitude: common practice of the trade, from memory
const latitudeStops = z
  .number('Expected a number of stops')
  .min(0, 'Expected 0 stops or more')
  .max(10, 'Expected at most 10 stops');

/**
 * Bounds of the reciprocity exponent p: 1 means no correction, and films published with a power law stay well
 * under 2 (common practice of the trade, from memory).
 */
export const reciprocityExponentRange = { min: 1, max: 2 } as const;

// p = 1.3 suits many films: common practice of the trade, from memory
export const defaultReciprocityExponent = 1.3;

/** What a manager sends to add a stock. */
export const createStockRequestSchema = z.strictObject({
  name: z.string().trim().min(1, 'Enter the stock’s name').max(120),
  maker: z.string().trim().min(1, 'Enter the maker').max(120),
  iso: filmSpeed('ISO speed'),
  process: filmProcessSchema,
  masked: z.boolean(),
  baseMaterial: z.string().trim().min(1, 'Enter the base material').max(120),
  frameFormats: z.array(z.string().trim().min(1).max(40)).min(1, 'List at least one frame format').max(20),
  notes: z.string().max(4000).default(''),
  recommendedEi: filmSpeed('EI').nullable().optional(),
  latitudeUnderStops: latitudeStops.nullable().optional(),
  latitudeOverStops: latitudeStops.nullable().optional(),
  pushPullNotes: z.string().max(4000).optional(),
  reciprocityExponent: z
    .number('Expected a number')
    .min(reciprocityExponentRange.min, `Expected p of ${reciprocityExponentRange.min} or more`)
    .max(reciprocityExponentRange.max, `Expected p of at most ${reciprocityExponentRange.max}`)
    .optional(),
  handlingNotes: z.string().max(4000).optional(),
});
export type CreateStockRequest = z.infer<typeof createStockRequestSchema>;

/**
 * What a manager sends to change a stock's sheet: any of its notes, EI, latitude and reciprocity exponent. The
 * stock's name, process and base stay as they are: profile documents name the stock they were made for.
 */
export const updateStockSheetRequestSchema = createStockRequestSchema
  .pick({
    recommendedEi: true,
    latitudeUnderStops: true,
    latitudeOverStops: true,
    pushPullNotes: true,
    reciprocityExponent: true,
    handlingNotes: true,
  })
  .extend({ notes: z.string().max(4000).optional() });
export type UpdateStockSheetRequest = z.infer<typeof updateStockSheetRequestSchema>;

/** Kinds of input device. */
export const scannerKinds = ['camera-rig', 'lab-scanner', 'flatbed'] as const;
export const scannerKindSchema = z.enum(scannerKinds);
export type ScannerKind = z.infer<typeof scannerKindSchema>;

/** An input device with its scanner input profile. */
export const scannerSchema = z.object({
  id: z.number().int().positive(),
  name: z.string(),
  kind: scannerKindSchema,
  inputProfile: scannerProfileSchema,
  createdAt: z.string(),
});
export type Scanner = z.infer<typeof scannerSchema>;

/** What a manager sends to add a scanner. */
export const createScannerRequestSchema = z.strictObject({
  name: z.string().trim().min(1, 'Enter the scanner’s name').max(120),
  kind: scannerKindSchema,
  inputProfile: scannerProfileSchema,
});
export type CreateScannerRequest = z.infer<typeof createScannerRequestSchema>;

/** What a manager sends to change a scanner: its whole record, as when adding it. */
export const updateScannerRequestSchema = createScannerRequestSchema;
export type UpdateScannerRequest = z.infer<typeof updateScannerRequestSchema>;

/** Filters of the stock catalogue; all optional. `q` matches name or maker, ignoring case. */
export const stockQuerySchema = z.strictObject({
  q: z.string().trim().max(120).optional(),
  process: filmProcessSchema.optional(),
  masked: z
    .enum(['true', 'false'], 'Expected true or false')
    .transform((v) => v === 'true')
    .optional(),
});
export type StockQuery = z.infer<typeof stockQuerySchema>;
