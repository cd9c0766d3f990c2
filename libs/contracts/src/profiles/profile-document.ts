import { z } from 'zod';

const finite = z.number().refine(Number.isFinite, 'must be a finite number');
const rgbTuple = z.tuple([finite, finite, finite]);

/**
 * How a scanner turns transmitted light into counts: encoding of the counts, black level and
 * channel gains per channel (gains from a scan of the bare light: gain_c = 1 / (bare_c − black_c)).
 * @example { name: 'Bench scanner A', encoding: 'linear', gamma: 1, blackLevel: [0.002, 0.002, 0.002], gains: [1, 1, 1] }
 */
export const scannerProfileSchema = z.strictObject({
  name: z.string().min(1),
  encoding: z.enum(['linear', 'srgb', 'gamma']),
  /** Exponent of the 'gamma' encoding: linear = code^gamma (ignored for other encodings). */
  gamma: z.number().positive(),
  /** Black level per channel as a fraction of full scale, after decoding. */
  blackLevel: z.tuple([z.number().min(0).max(0.5), z.number().min(0).max(0.5), z.number().min(0).max(0.5)]),
  /** Channel gains applied after black subtraction, unitless. */
  gains: z.tuple([z.number().positive(), z.number().positive(), z.number().positive()]),
});
/** A scanner input profile. */
export type ScannerProfile = z.infer<typeof scannerProfileSchema>;

/** One control point of a characteristic curve: log10 exposure (lux·s) and density above base. */
export const curvePointSchema = z.strictObject({ logExposure: finite, density: finite });
export type CurvePoint = z.infer<typeof curvePointSchema>;

/** A channel's characteristic curve: at least two points, both coordinates strictly increasing. */
export const channelCurveSchema = z
  .strictObject({ points: z.array(curvePointSchema).min(2) })
  .superRefine((curve, ctx) => {
    for (let i = 1; i < curve.points.length; i++) {
      const a = curve.points[i - 1]!;
      const b = curve.points[i]!;
      if (!(b.logExposure > a.logExposure))
        ctx.addIssue({
          code: 'custom',
          path: ['points', i, 'logExposure'],
          message: 'log exposure must increase from point to point',
        });
      if (!(b.density > a.density))
        ctx.addIssue({
          code: 'custom',
          path: ['points', i, 'density'],
          message: 'density must increase from point to point',
        });
    }
  });
export type ChannelCurve = z.infer<typeof channelCurveSchema>;

/**
 * Balance in printer points (1 point = 0.025 log exposure) on the positive's axes.
 * Sign convention: positive values make the positive more red, more green, more blue;
 * negative values make it more cyan, more magenta, more yellow.
 */
export const balanceSchema = z.strictObject({ cyanRed: finite, magentaGreen: finite, yellowBlue: finite });
export type Balance = z.infer<typeof balanceSchema>;

/** Print-like tone curve: contrast (1 = as scene), black and white points in scene-linear units. */
export const toneSchema = z
  .strictObject({
    contrast: z.number().positive().max(4),
    blackPoint: z.number().min(0).max(0.5),
    whitePoint: z.number().positive().max(16),
  })
  .refine((t) => t.whitePoint > t.blackPoint, {
    message: 'white point must be above black point',
    path: ['whitePoint'],
  });
export type Tone = z.infer<typeof toneSchema>;

/**
 * The primaries a film records its three exposures in: 'srgb' (the sRGB / BT.709 primaries) or 'wide' (the
 * ITU-R BT.2020 primaries, a film of wide-gamut sensitivity). Same D65 white for both.
 */
export const capturePrimariesSchema = z.enum(['srgb', 'wide']);
export type CapturePrimaries = z.infer<typeof capturePrimariesSchema>;

/**
 * A versioned stock profile: everything needed to invert one film stock.
 *
 * Schema version 1 grows only by optional fields; a document without one reads as it always did:
 * - `capturePrimaries` (optional, added later in version 1): absent reads as 'srgb', the recovered exposures are
 *   taken as linear sRGB and rendered exactly as before; 'wide' converts them from BT.2020 to sRGB primaries.
 * - `exposureMatrix` (optional, added later in version 1): absent renders exactly as before; present, it is the
 *   change of primaries and takes the place of `capturePrimaries`.
 */
export const profileDocumentSchema = z.strictObject({
  schemaVersion: z.literal(1),
  id: z.string().min(1),
  version: z.int().min(1),
  stock: z.strictObject({
    name: z.string().min(1),
    process: z.literal('C-41'),
    base: z.enum(['clear', 'tinted', 'masked']),
    iso: z.number().positive(),
  }),
  curves: z.strictObject({ red: channelCurveSchema, green: channelCurveSchema, blue: channelCurveSchema }),
  /** Row-major dye crosstalk matrix on densities, D' = M·D. */
  crosstalk: z.tuple([rgbTuple, rgbTuple, rgbTuple]),
  balance: balanceSchema,
  tone: toneSchema,
  /** Saturation factor, 1 = unchanged. */
  saturation: z.number().min(0).max(3),
  /** Primaries of the film's recorded exposures; absent = 'srgb'. */
  capturePrimaries: capturePrimariesSchema.optional(),
  /**
   * Row-major exposure-space colour matrix fitted by calibration: the film's recorded exposures (linear, grey = 1) →
   * linear sRGB. Each row sums to 1 (within 0.001), so a grey stays grey.
   */
  exposureMatrix: z
    .tuple([rgbTuple, rgbTuple, rgbTuple])
    .superRefine((m, ctx) =>
      m.forEach((row, r) => {
        if (!(Math.abs(row[0] + row[1] + row[2] - 1) <= 1e-3))
          ctx.addIssue({ code: 'custom', path: [r], message: 'each row must sum to 1 so a grey stays grey' });
      }),
    )
    .optional(),
});
export type ProfileDocument = z.infer<typeof profileDocumentSchema>;

/** A validation error with a dotted path, e.g. 'curves.red.points[2].density'. */
export interface ProfileFieldError {
  path: string;
  message: string;
}

function formatPath(path: readonly PropertyKey[]): string {
  let out = '';
  for (const key of path) {
    if (typeof key === 'number') out += `[${key}]`;
    else out += out ? `.${String(key)}` : String(key);
  }
  return out;
}

/**
 * Validates an untrusted profile document.
 * @example validateProfileDocument(JSON.parse(text)) // { ok: true, value } or { ok: false, errors: [{ path: 'curves.red.points[2].density', message }] }
 */
export function validateProfileDocument(
  json: unknown,
): { ok: true; value: ProfileDocument } | { ok: false; errors: ProfileFieldError[] } {
  const result = profileDocumentSchema.safeParse(json);
  if (result.success) return { ok: true, value: result.data };
  return {
    ok: false,
    errors: result.error.issues.map((issue) => ({ path: formatPath(issue.path), message: issue.message })),
  };
}

/**
 * Validates an untrusted scanner profile.
 * @example validateScannerProfile({ name: 'A', encoding: 'linear', gamma: 1, blackLevel: [0, 0, 0], gains: [1, 1, 1] }).ok // true
 */
export function validateScannerProfile(
  json: unknown,
): { ok: true; value: ScannerProfile } | { ok: false; errors: ProfileFieldError[] } {
  const result = scannerProfileSchema.safeParse(json);
  if (result.success) return { ok: true, value: result.data };
  return {
    ok: false,
    errors: result.error.issues.map((issue) => ({ path: formatPath(issue.path), message: issue.message })),
  };
}
