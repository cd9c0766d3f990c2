import type { MeasuredBase, PixelRegion, ProfileDocument, ScannerProfile } from '@clearbase/contracts';
import {
  levelSample,
  measureFrameLevels,
  type FrameLevels,
  type Rgb,
  type RgbImage,
} from '@clearbase/inversion';
import { measureNegativeBase } from '../film-base/measure-film-base';
import { downsampleNegative } from './working-negative';

/** Reduce a decoded scan to its working negative and keep the sample its levels are measured on. */
export interface MakeWorkingNegativeTask {
  kind: 'make';
  image: RgbImage;
  longEdge: number;
}

/** A working negative and the level sample of the full scan it came from. */
export interface MadeWorkingNegative {
  working: RgbImage;
  /** `levelSample` of the full scan: measuring it with `{ step: 1 }` gives the full scan's levels. */
  sample: RgbImage;
}

/** Measure the levels of a full scan from its level sample, against a base. */
export interface MeasureLevelsTask {
  kind: 'levels';
  sample: RgbImage;
  profile: ProfileDocument;
  scanner: ScannerProfile;
  base: Rgb;
}

/** Measure a decoded scan's film base automatically, or in a rectangle. */
export interface MeasureBaseTask {
  kind: 'base';
  image: RgbImage;
  scanner: ScannerProfile;
  region: PixelRegion | null;
}

export type WorkingNegativeTask = MakeWorkingNegativeTask | MeasureLevelsTask | MeasureBaseTask;
export type WorkingNegativeResult = MadeWorkingNegative | FrameLevels | MeasuredBase;

/**
 * The pixel loops behind the tuning screen's working negative, run on a worker thread (see
 * `working-negative-worker.ts`) so the server keeps answering while a full scan is reduced or measured.
 */
export default function runWorkingNegativeTask(task: WorkingNegativeTask): WorkingNegativeResult {
  switch (task.kind) {
    case 'make':
      return { working: downsampleNegative(task.image, task.longEdge), sample: levelSample(task.image) };
    case 'levels':
      // the same settings as the roll job's measurement of the full scan (print render, 8-bit tables)
      return measureFrameLevels(
        { profile: task.profile, scanner: task.scanner, base: task.base, render: 'print', outputBits: 8 },
        task.sample,
        { step: 1 },
      );
    case 'base':
      return measureNegativeBase(task.image, task.scanner, task.region);
  }
}
