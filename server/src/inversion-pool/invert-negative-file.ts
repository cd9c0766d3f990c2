import { performance } from 'node:perf_hooks';
import type { ProfileDocument, ScannerProfile } from '@clearbase/contracts';
import {
  compileInversion,
  levelsToTone,
  measureFrameLevels,
  meteredMidLogExposure,
  neutralBalance,
  stopsToLogExposure,
  type FilmBase,
  type FrameLevels,
  type InversionParams,
  type InversionPlan,
  type MeasureLevelsOptions,
  type Region,
  type RgbImage,
} from '@clearbase/inversion';
import {
  DEFAULT_JPEG_QUALITY,
  readNegative,
  writePositive,
  type NegativeImage,
  type PositiveFormat,
  type PositiveMetadata,
  type ReadNegativeOptions,
} from '../imaging/index';
import { measureFilmBase } from '../film-base/measure-film-base';
import { createJpegStripWriter } from '../imaging/jpeg-strips';
import { writeFileAtomically } from '../imaging/write-positive';
import type { InversionPool } from './inversion-pool';
import { measureWhileReading } from './measure-while-reading';

/** Default profile: the same straight line (gamma 0.6, common practice of the trade) on every channel. */
export const NEUTRAL_PROFILE: ProfileDocument = (() => {
  const line = { points: [-4, 2].map((logExposure) => ({ logExposure, density: 0.6 * (logExposure + 4) })) };
  return {
    schemaVersion: 1,
    id: 'neutral',
    version: 1,
    stock: { name: 'Neutral', process: 'C-41', base: 'clear', iso: 100 },
    curves: { red: line, green: line, blue: line },
    crosstalk: [
      [1, 0, 0],
      [0, 1, 0],
      [0, 0, 1],
    ],
    balance: { cyanRed: 0, magentaGreen: 0, yellowBlue: 0 },
    tone: { contrast: 1, blackPoint: 0, whitePoint: 1 },
    saturation: 1,
  };
})();

export interface FrameSettings {
  profile: ProfileDocument;
  scanner: ScannerProfile;
  /** Detect the base, sample a rectangle, or use a known base (a roll base). */
  base: 'auto' | Region | FilmBase;
  /** Roll-wide levels measured against `base`; per frame when absent. */
  levels?: FrameLevels;
  /**
   * Where E_mid comes from: the levels (`auto`, the default) or the profile's metered grey (`metered`, no levels);
   * `stops` more exposure printed either way (+ lighter, default 0).
   */
  exposure?: { mode: 'auto' | 'metered'; stops: number };
  render: 'print' | 'reference';
  format: PositiveFormat;
  quality?: number;
  maxPixels?: number;
}

export interface FrameResult {
  file: string;
  output: string;
  base: FilmBase;
  warnings: string[];
  exposure: ExposureUsed;
  ms: number;
}

/** The exposure a frame was printed at: the log exposure printed as mid grey (stops included) and its source. */
export interface ExposureUsed {
  midLogExposure: number;
  source: 'frame-levels' | 'roll-levels' | 'metered';
  stops: number;
}

/** The frame's own levels (E_mid, channel means, black and white points) against `base`. */
export function measureLevels(
  negative: RgbImage,
  settings: Pick<FrameSettings, 'profile' | 'scanner' | 'render'>,
  base: FilmBase,
  options: MeasureLevelsOptions = {},
): FrameLevels {
  return measureFrameLevels(
    {
      profile: settings.profile,
      scanner: settings.scanner,
      base: base.rgb,
      render: settings.render,
      outputBits: 8,
    },
    negative,
    options,
  );
}

/**
 * Inversion parameters from levels: E_mid, a neutral (grey-world) balance and the tone's black and
 * white points, the profile's contrast kept.
 */
export function inversionParams(
  settings: Pick<FrameSettings, 'profile' | 'scanner' | 'render'>,
  base: FilmBase,
  levels: FrameLevels,
  outputBits: 8 | 16,
): InversionParams {
  const { profile } = settings;
  return {
    profile: { ...profile, tone: levelsToTone(levels, profile.tone.contrast) },
    scanner: settings.scanner,
    base: base.rgb,
    balances: [neutralBalance(levels)],
    midLogExposure: levels.midLogExposure,
    render: settings.render,
    outputBits,
  };
}

/**
 * Inversion parameters at the profile's metered exposure (`meteredMidLogExposure`): no levels, so the profile's own
 * tone and balance, no grey-world balance.
 */
export function meteredInversionParams(
  settings: Pick<FrameSettings, 'profile' | 'scanner' | 'render'>,
  base: FilmBase,
  outputBits: 8 | 16,
): InversionParams {
  return {
    profile: settings.profile,
    scanner: settings.scanner,
    base: base.rgb,
    midLogExposure: meteredMidLogExposure(settings.profile),
    render: settings.render,
    outputBits,
  };
}

/** Decodes a negative straight into one of the pool's shared buffers (give it back with `pool.buffers.release`). */
export function readPooledNegative(
  pool: InversionPool,
  file: string,
  settings: Pick<FrameSettings, 'maxPixels'>,
  onRows?: ReadNegativeOptions['onRows'],
): Promise<NegativeImage> {
  return readNegative(file, {
    allocate: (samples) => pool.buffers.acquire(Uint16Array, samples),
    release: (array) => pool.buffers.release(array),
    ...(settings.maxPixels ? { maxPixels: settings.maxPixels } : {}),
    ...(onRows ? { onRows } : {}),
  });
}

/**
 * Reads one negative (unless `decoded` holds it already, from `readPooledNegative`), inverts it on the pool
 * and writes the positive atomically to `output`; the negative's buffer goes back to the pool either way.
 * Throws `ImageInputError` for an unreadable negative and `FilmBaseError` for an unusable base
 * (nothing is written then).
 */
export async function invertNegativeFile(
  pool: InversionPool,
  file: string,
  output: string,
  settings: FrameSettings,
  decoded?: NegativeImage,
): Promise<FrameResult> {
  const start = performance.now();
  // A frame read here is measured as it is copied in, while its rows are in cache (same base and levels).
  const reading = decoded
    ? null
    : measureWhileReading(settings.scanner, {
        detectBase: settings.base === 'auto',
        sampleLevels: !settings.levels && settings.exposure?.mode !== 'metered',
      });
  const negative = decoded ?? (await readPooledNegative(pool, file, settings, reading?.onRows));
  const outKind = settings.format === 'jpeg' ? Uint8Array : Uint16Array;
  const pixels = pool.buffers.acquire(outKind, negative.data.length);
  let measured: ReturnType<typeof measureFilmBase>;
  let exposure: ExposureUsed;
  try {
    measured = measureFilmBase(negative, settings, reading ?? undefined);
    const outputBits = outKind === Uint8Array ? 8 : 16;
    const stops = settings.exposure?.stops ?? 0;
    let params: InversionParams;
    if (settings.exposure?.mode === 'metered') {
      params = meteredInversionParams(settings, measured.base, outputBits);
      exposure = { midLogExposure: params.midLogExposure, source: 'metered', stops };
    } else {
      const levels =
        settings.levels ??
        (reading
          ? measureLevels(reading.levelSample(), settings, measured.base, { step: 1 })
          : measureLevels(negative, settings, measured.base));
      params = inversionParams(settings, measured.base, levels, outputBits);
      exposure = {
        midLogExposure: levels.midLogExposure,
        source: settings.levels ? 'roll-levels' : 'frame-levels',
        stops,
      };
    }
    // Positive stops print more exposure: the log exposure printed as mid grey moves down by them.
    exposure.midLogExposure -= stopsToLogExposure(stops);
    const plan = compileInversion({ ...params, exposureStops: stops });
    const metadata: PositiveMetadata = {
      stock: settings.profile.stock.name,
      profileVersion: `${settings.profile.id}@${settings.profile.version}`,
      scanner: settings.scanner.name,
      adjustments: { render: settings.render, base: measured.base.rgb.map((v) => Number(v.toFixed(5))) },
      sourceFile: file.split(/[\\/]/).pop() ?? file,
    };
    await invertAndWrite(pool, plan, negative, pixels, output, settings, metadata);
  } finally {
    pool.buffers.release(negative.data);
    pool.buffers.release(pixels);
  }
  return {
    file,
    output,
    base: measured.base,
    warnings: [...negative.warnings, ...measured.warnings],
    exposure,
    ms: Math.round(performance.now() - start),
  };
}

/**
 * Inverts a decoded negative into `pixels` (a pooled buffer, 8-bit for JPEG, else 16-bit) on the pool and writes
 * the positive atomically to `output`. A JPEG is written in strips, each encoded (on libuv's threads) as soon as the
 * workers have written its rows, while later ones are inverted; it resolves only when no strip still reads `pixels`.
 */
export async function invertAndWrite(
  pool: InversionPool,
  plan: InversionPlan,
  negative: NegativeImage,
  pixels: Uint8Array | Uint16Array,
  output: string,
  settings: Pick<FrameSettings, 'format' | 'quality'>,
  metadata: PositiveMetadata,
): Promise<void> {
  const { width, height } = negative;
  if (!(pixels instanceof Uint8Array)) {
    await pool.invertFrame(plan, negative.data, pixels, width, height);
    await writePositive(pixels, {
      path: output,
      width,
      height,
      format: settings.format,
      ...(settings.quality ? { quality: settings.quality } : {}),
      metadata,
    });
    return;
  }
  const quality = settings.quality ?? DEFAULT_JPEG_QUALITY;
  const writer = createJpegStripWriter({ width, height, quality, metadata });
  const rowBytes = width * 3;
  try {
    await pool.invertFrame(plan, negative.data, pixels, width, height, {
      rows: writer.stripRows,
      done: (k) => {
        const first = k * writer.stripRows * rowBytes;
        writer.encode(k, pixels.subarray(first, first + writer.stripHeight(k) * rowBytes));
      },
    });
    await writeFileAtomically(output, await writer.finish());
  } finally {
    // No strip may still be reading the output buffer when it goes back to the pool.
    await writer.settled();
  }
}
