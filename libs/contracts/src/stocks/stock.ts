import { z } from 'zod';
import { scannerProfileSchema } from '../profile/profile-document';

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
  createdAt: z.string(),
});
export type Stock = z.infer<typeof stockSchema>;

/** What a manager sends to add a stock. */
export const createStockRequestSchema = z.strictObject({
  name: z.string().trim().min(1, 'Enter the stock’s name').max(120),
  maker: z.string().trim().min(1, 'Enter the maker').max(120),
  // ISO 6 to 25600 spans the speeds film is sold at: common practice of the trade, from memory
  iso: z.int('Expected a whole ISO speed').min(6).max(25600),
  process: filmProcessSchema,
  masked: z.boolean(),
  baseMaterial: z.string().trim().min(1, 'Enter the base material').max(120),
  frameFormats: z.array(z.string().trim().min(1).max(40)).min(1, 'List at least one frame format').max(20),
  notes: z.string().max(4000).default(''),
});
export type CreateStockRequest = z.infer<typeof createStockRequestSchema>;

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
