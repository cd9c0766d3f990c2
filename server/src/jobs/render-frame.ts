import type { OutputFormat, ProfileDocument, QcFlag, ScannerProfile } from '@clearbase/contracts';
import {
  compileInversion,
  frameRenderParams,
  type FilmBase,
  type FrameLevels,
  type SavedAdjustments,
} from '@clearbase/inversion';
import type { FileStore } from '../files/file-store';
import { encodePositive, positivePipeline, readNegative, type PositiveMetadata } from '../imaging/index';
import type { InversionPool } from '../inversion-pool/inversion-pool';
import { measureLevels } from '../inversion-pool/invert-negative-file';
import { measureWhileReading } from '../inversion-pool/measure-while-reading';
import type { FrameOutputKind } from '../frames/frame-tables';
import { frameQcFlags } from './frame-qc-flags';

/** Long edge of the preview JPEG, pixels (the same as the negative preview). */
export const positivePreviewLongEdge = 2048;
// 85 for previews seen on screen: common practice for web images, from memory
const previewQuality = 85;

const mediaTypes: Record<OutputFormat, string> = {
  jpeg: 'image/jpeg',
  tiff16: 'image/tiff',
  png16: 'image/png',
};

export interface FrameRenderRequest {
  sourcePath: string;
  fileName: string;
  profile: ProfileDocument;
  scanner: ScannerProfile;
  base: FilmBase;
  roll: SavedAdjustments;
  frame: SavedAdjustments;
  formats: readonly OutputFormat[];
  /** Long edge of the full-size outputs; null keeps the scan's size. */
  longEdge: number | null;
  maxPixels: number;
  /** Levels to render with: the roll's, or fixed at the metered exposure (`levelsSource`); the frame's own when absent. */
  levels?: FrameLevels;
  /** Where `levels` came from; 'roll' when they are given without it. */
  levelsSource?: 'roll' | 'metered';
}

export interface StoredRender {
  kind: FrameOutputKind;
  sha256: string;
  size: number;
  mediaType: string;
}

/**
 * Renders one frame: decodes the negative, measures its levels against `base`, inverts it on the worker pool at 16
 * bits with the profile plus the roll's and the frame's adjustments, summed by `sumAdjustments` as the browser's
 * preview sums them (balances, exposures and black and white point shifts add, the frame's contrast wins over the
 * roll's, which wins over the profile's), and stores the preview JPEG (long edge 2048) and
 * each full-size format. Every file is flushed to disk under a temp name and renamed into the store; nothing is
 * recorded in the database here.
 */
export async function renderFrame(
  pool: InversionPool,
  store: FileStore,
  request: FrameRenderRequest,
): Promise<{ outputs: StoredRender[]; qcFlags: QcFlag[]; warnings: string[] }> {
  // The frame's own levels are sampled as it is copied in, while its rows are in cache (the same levels).
  const reading = request.levels
    ? null
    : measureWhileReading(request.scanner, { detectBase: false, sampleLevels: true });
  const negative = await readNegative(request.sourcePath, {
    maxPixels: request.maxPixels,
    allocate: (samples) => pool.buffers.acquire(Uint16Array, samples),
    ...(reading ? { onRows: reading.onRows } : {}),
  });
  const positive = pool.buffers.acquire(Uint16Array, negative.data.length);
  try {
    const settings = { profile: request.profile, scanner: request.scanner, render: 'print' as const };
    const levels =
      request.levels ?? measureLevels(reading!.levelSample(), settings, request.base, { step: 1 });
    const params = frameRenderParams({
      profile: request.profile,
      scanner: request.scanner,
      base: request.base.rgb,
      levels,
      roll: request.roll,
      frame: request.frame,
      outputBits: 16,
    });
    await pool.invertFrame(
      compileInversion(params),
      negative.data,
      positive,
      negative.width,
      negative.height,
    );

    const qcFlags = frameQcFlags(negative, positive, request.scanner, request.base.rgb[1]);
    const { width, height } = negative;
    const metadata: PositiveMetadata = {
      stock: request.profile.stock.name,
      profileVersion: `${request.profile.id}@${request.profile.version}`,
      scanner: request.scanner.name,
      adjustments: {
        roll: request.roll,
        frame: request.frame,
        base: request.base.rgb.map((v) => Number(v.toFixed(6))),
        levels: request.levels ? (request.levelsSource ?? 'roll') : 'frame',
      },
      sourceFile: request.fileName,
    };
    const fit = (edge: number | null) =>
      edge !== null && Math.max(width, height) > edge
        ? { width: edge, height: edge, fit: 'inside' as const, withoutEnlargement: true }
        : null;
    const encodings: { kind: FrameOutputKind; mediaType: string; bytes: Promise<Buffer> }[] = [];
    const preview = positivePipeline(positive, {
      width,
      height,
      format: 'jpeg',
      quality: previewQuality,
      metadata,
    });
    const previewFit = fit(positivePreviewLongEdge);
    encodings.push({
      kind: 'preview',
      mediaType: 'image/jpeg',
      bytes: (previewFit ? preview.resize(previewFit) : preview).toBuffer(),
    });
    for (const format of request.formats) {
      const size = fit(request.longEdge);
      // A full-size JPEG goes through the strip encoder: the same pixels and metadata, encoded on several threads
      // and without sharp's sRGB → sRGB transform; a resized one needs sharp's pipeline for the resize.
      const pipeline = () => positivePipeline(positive, { width, height, format, metadata });
      const bytes =
        format === 'jpeg' && !size
          ? encodePositive(positive, { width, height, format, metadata })
          : (size ? pipeline().resize(size) : pipeline()).toBuffer();
      encodings.push({ kind: format, mediaType: mediaTypes[format], bytes });
    }
    const encoded = await Promise.all(encodings.map((e) => e.bytes));
    const outputs: StoredRender[] = [];
    for (const [i, e] of encodings.entries()) {
      const stored = await store.putBytes(encoded[i]!);
      outputs.push({ kind: e.kind, sha256: stored.sha256, size: stored.size, mediaType: e.mediaType });
    }
    return { outputs, qcFlags, warnings: negative.warnings };
  } finally {
    pool.buffers.release(negative.data);
    pool.buffers.release(positive);
  }
}
