import { performance } from 'node:perf_hooks';
import { readNegative, writePositive, type PositiveFormat } from '../imaging/index';
import type { InversionPool } from './inversion-pool';
import {
  baseFromRegion,
  compileDensity,
  compileInversion,
  densityLevels,
  type DensityStage,
  detectFilmBase,
  type FilmBase,
  type InversionParams,
  type Region,
  type Rgb,
  type ScannerProfile,
  type StockProfile,
} from './inversion-kernel';

// Below this a detected base is not trusted; the frame is flagged for QC; from memory.
export const MIN_BASE_CONFIDENCE = 0.3;

export interface FrameSettings {
  stock: StockProfile;
  scanner: ScannerProfile;
  /** Detect the base, sample a rectangle, or use a known base (a roll base). */
  base: 'auto' | Region | FilmBase;
  /** Roll-wide shadow and highlight densities measured against `base`; per frame when absent. */
  levels?: { shadow: Rgb; highlight: Rgb };
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
  ms: number;
}

/**
 * Measures a negative's film base the way `settings.base` asks, and the frame's own levels
 * against that base. Used by roll processing (first pass) and by `invertNegativeFile`.
 */
export function measureFrame(
  negative: { width: number; height: number; data: Uint16Array },
  settings: Pick<FrameSettings, 'base' | 'stock' | 'scanner'>,
): { base: FilmBase; levels: { shadow: Rgb; highlight: Rgb }; density: DensityStage; warnings: string[] } {
  const warnings: string[] = [];
  const base =
    settings.base === 'auto'
      ? detectFilmBase(negative, settings.scanner)
      : Array.isArray(settings.base)
        ? baseFromRegion(negative, settings.base, settings.scanner)
        : settings.base;
  if (base.confidence < MIN_BASE_CONFIDENCE) {
    warnings.push(
      `No reliable film base found (confidence ${base.confidence}); check the frame, or draw the base region by hand.`,
    );
  }
  const density = compileDensity({ base: base.rgb, scanner: settings.scanner, stock: settings.stock });
  return { base, levels: densityLevels(density, negative.data), density, warnings };
}

function paramsFor(
  settings: Pick<FrameSettings, 'stock' | 'scanner'>,
  base: FilmBase,
  levels: InversionParams['levels'],
  output: InversionParams['output'],
  render: InversionParams['render'],
): InversionParams {
  return { stock: settings.stock, scanner: settings.scanner, base: base.rgb, levels, render, output };
}

/**
 * Reads one negative, inverts it on the pool and writes the positive atomically to `output`.
 * Throws `ImageInputError` for an unreadable negative (nothing is written then).
 */
export async function invertNegativeFile(
  pool: InversionPool,
  file: string,
  output: string,
  settings: FrameSettings,
): Promise<FrameResult> {
  const start = performance.now();
  const negative = await readNegative(file, {
    allocate: (samples) => pool.buffers.acquire(Uint16Array, samples),
    ...(settings.maxPixels ? { maxPixels: settings.maxPixels } : {}),
  });
  const outKind = settings.format === 'jpeg' ? Uint8Array : Uint16Array;
  const pixels = pool.buffers.acquire(outKind, negative.data.length);
  let measured: ReturnType<typeof measureFrame>;
  try {
    measured = measureFrame(negative, settings);
    const plan = compileInversion(
      paramsFor(
        settings,
        measured.base,
        settings.levels ?? measured.levels,
        outKind === Uint8Array ? 'u8' : 'u16',
        settings.render,
      ),
      measured.density,
    );
    await pool.invertFrame(plan, negative.data, pixels, negative.width, negative.height);
    await writePositive(pixels, {
      path: output,
      width: negative.width,
      height: negative.height,
      format: settings.format,
      ...(settings.quality ? { quality: settings.quality } : {}),
      metadata: {
        stock: settings.stock.stock,
        profileVersion: `${settings.stock.stock}@${settings.stock.version}`,
        scanner: settings.scanner.name,
        adjustments: { render: settings.render, base: measured.base.rgb.map((v) => Number(v.toFixed(5))) },
        sourceFile: file.split(/[\\/]/).pop() ?? file,
      },
    });
  } finally {
    pool.buffers.release(negative.data);
    pool.buffers.release(pixels);
  }
  return {
    file,
    output,
    base: measured.base,
    warnings: [...negative.warnings, ...measured.warnings],
    ms: Math.round(performance.now() - start),
  };
}
