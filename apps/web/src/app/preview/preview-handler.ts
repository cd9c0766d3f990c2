import { measureFrameLevels } from '@clearbase/inversion';
import type { PreviewAnswer, PreviewRequest } from './preview-messages';
import { quantiseDensities, renderQuantised } from './preview-kernel';
import { createPreviewPlanBuilder, type PreviewPlanBuilder } from './preview-plan-builder';

/** Quantised densities kept per crosstalk matrix: the saved and the edited side, and one more (9 MB each at 1.5 MP). */
const KEPT_MATRICES = 3;

/** Measure every n-th pixel each way for the preview's auto exposure: 8 leaves ~23 000 samples of 1.5 MP. */
const LEVELS_STEP = 8;

interface LoadedNegative {
  width: number;
  height: number;
  pixels: Uint16Array;
  planFor: PreviewPlanBuilder;
  /** Densities after crosstalk per pixel, by crosstalk matrix, newest last. */
  densities: Map<string, Uint16Array>;
}

/** Handles one message of the preview protocol and says what to answer. */
export type PreviewHandler = (message: PreviewRequest) => PreviewAnswer;

function failure(id: number | null, err: unknown): PreviewAnswer {
  const reason = err instanceof Error ? err.message : String(err);
  return {
    reply: { kind: 'failed', id, message: `The preview could not be rendered: ${reason}` },
    transfer: [],
  };
}

/**
 * The preview worker's logic, free of any Worker: keeps the loaded negative and its plan caches between messages.
 * `clock` is injectable so tests can count time; it defaults to `performance.now`.
 * @example const handle = createPreviewHandler(); handle(load); const { reply } = handle({ kind: 'render', id: 1, side: 'after', profile });
 */
export function createPreviewHandler(clock: () => number = () => performance.now()): PreviewHandler {
  let negative: LoadedNegative | null = null;
  return (message) => {
    if (message.kind === 'load') {
      try {
        const start = clock();
        const image = { width: message.width, height: message.height, data: message.pixels };
        const levels =
          message.levels ??
          measureFrameLevels(
            {
              profile: message.levelsProfile,
              scanner: message.scanner,
              base: message.base,
              render: 'print',
              outputBits: 8,
            },
            image,
            { step: LEVELS_STEP },
          );
        negative = {
          width: message.width,
          height: message.height,
          pixels: message.pixels,
          planFor: createPreviewPlanBuilder(message.scanner, message.base, levels.midLogExposure),
          densities: new Map(),
        };
        return {
          reply: {
            kind: 'loaded',
            width: message.width,
            height: message.height,
            midLogExposure: levels.midLogExposure,
            measureMs: clock() - start,
          },
          transfer: [],
        };
      } catch (err) {
        return failure(null, err);
      }
    }
    if (!negative)
      return {
        reply: { kind: 'failed', id: message.id, message: 'No negative is loaded yet.' },
        transfer: [],
      };
    try {
      const { width, height, pixels, densities } = negative;
      const count = width * height;
      const start = clock();
      const plan = negative.planFor(message.profile);
      const key = JSON.stringify(message.profile.crosstalk);
      let indices = densities.get(key);
      if (!indices) {
        indices = quantiseDensities(plan, pixels, count);
        densities.set(key, indices);
        if (densities.size > KEPT_MATRICES) densities.delete(densities.keys().next().value!);
      }
      const planned = clock();
      const rgba = new Uint8ClampedArray(count * 4);
      renderQuantised(plan, indices, rgba, count);
      const done = clock();
      return {
        reply: {
          kind: 'rendered',
          id: message.id,
          side: message.side,
          width,
          height,
          rgba,
          compileMs: planned - start,
          renderMs: done - planned,
        },
        transfer: [rgba.buffer],
      };
    } catch (err) {
      return failure(message.id, err);
    }
  };
}
