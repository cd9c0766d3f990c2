import type { ScannerProfile } from '@clearbase/contracts';
import type { Region } from '../film-base';
import {
  chartScene,
  exposeNegative,
  greySteps,
  type FilmStock,
  type SyntheticNegative,
} from '../forward-model';
import { MID_GREY } from '../tone-curve';
import type { Rgb } from '../srgb';
import { CHART_REFERENCE } from './chart-reference';
import type { Point } from './homography';

/** Options of `calibrationRoll`. */
export interface CalibrationRollOptions {
  stock: FilmStock;
  scanner: ScannerProfile;
  /** Grey card exposures, stops from the metered exposure. Default −6 … +8 in half stops. */
  stops?: readonly number[];
  /** Exposure of the chart frame, stops. Default 0. */
  chartStops?: number;
  /** Light on the chart relative to the grey card's, per channel (1 = the same light). Default [1, 1, 1]. */
  chartLight?: Rgb;
  /** Side of one chart patch, pixels. Default 20. */
  patchSize?: number;
  /** Side of a grey frame, pixels. Default 24. */
  greySize?: number;
  /** Height of a grey frame's exposed area, pixels, when it is not square. Default `greySize`. */
  greyHeight?: number;
  /** Also make a frame of unexposed leader (film base and fog only), as wide and tall as a grey frame. */
  leader?: boolean;
  /** Grain, D. Default 0.01. */
  grain?: number;
  /** Rebate above and below each frame, pixels. Default 6. */
  rebate?: number;
}

/** A synthetic calibration roll with its marks. */
export interface CalibrationRoll {
  brackets: { stops: number; negative: SyntheticNegative }[];
  chart: SyntheticNegative;
  /** Unexposed leader, when asked for. */
  leader?: SyntheticNegative;
  /** Where the chart sits in its frame, and its corners in chart order (patch 1, 6, 24, 19). */
  chartRegion: Region;
  chartCorners: Point[];
  /** The grey rectangle to sample on every grey frame (its central half). */
  greyRegion: Region;
  /** A rebate strip of unexposed film on every frame. */
  baseRegion: Region;
}

/**
 * A calibration roll made with the forward film model: a grey card (18 %) bracketed over `stops` and one
 * frame of the 24-patch chart (published L*a*b*), each between rebate strips. For tests and the demo.
 * @example calibrationRoll({ stock: TINTLINE_400, scanner: LINEAR_SCANNER }).brackets.length // 29
 */
export function calibrationRoll(options: CalibrationRollOptions): CalibrationRoll {
  const stops = options.stops ?? Array.from({ length: 29 }, (_, i) => -6 + i / 2);
  const grain = options.grain ?? 0.01;
  const rebate = options.rebate ?? 6;
  const size = options.greySize ?? 24;
  const greyHeight = options.greyHeight ?? size;
  const patch = options.patchSize ?? 20;
  const light = options.chartLight ?? [1, 1, 1];
  const brackets = stops.map((s, i) => ({
    stops: s,
    negative: exposeNegative(greySteps(1, MID_GREY, MID_GREY, size, greyHeight), {
      stock: options.stock,
      scanner: options.scanner,
      exposureStops: s,
      grain,
      seed: 101 + i,
      rebate,
    }),
  }));
  const { scene } = chartScene(
    CHART_REFERENCE.map((p) => ({ name: p.name, labD50: p.labD50 })),
    patch,
  );
  for (let i = 0; i < scene.rgb.length; i++) scene.rgb[i] = scene.rgb[i]! * light[i % 3]!;
  const chart = exposeNegative(scene, {
    stock: options.stock,
    scanner: options.scanner,
    exposureStops: options.chartStops ?? 0,
    grain,
    seed: 7,
    rebate,
  });
  const q = Math.round(size / 4);
  const qh = Math.round(greyHeight / 4);
  // leader: no light at all reaches it, so every pixel is film base and fog (scene at the model's floor)
  const leader = options.leader
    ? exposeNegative(
        { width: size, height: greyHeight, rgb: new Float32Array(size * greyHeight * 3) },
        { stock: options.stock, scanner: options.scanner, grain, seed: 5, rebate },
      )
    : undefined;
  return {
    brackets,
    chart,
    ...(leader ? { leader } : {}),
    chartRegion: [0, rebate, scene.width, scene.height],
    chartCorners: [
      [0, rebate],
      [scene.width, rebate],
      [scene.width, rebate + scene.height],
      [0, rebate + scene.height],
    ],
    greyRegion: [q, rebate + qh, size - 2 * q, greyHeight - 2 * qh],
    baseRegion: [0, 0, size, rebate],
  };
}
