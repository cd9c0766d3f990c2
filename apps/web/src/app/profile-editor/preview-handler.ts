import { applyInversion, measureFrameLevels } from '@clearbase/inversion';
import type { PreviewAnswer, PreviewRequest } from './preview-messages';
import { createPreviewPlanBuilder, type PreviewPlanBuilder } from './preview-plan-builder';

/** Measure every n-th pixel each way for the preview's auto exposure: 8 leaves ~23 000 samples of 1.5 MP. */
const LEVELS_STEP = 8;

interface LoadedNegative {
  width: number;
  height: number;
  pixels: Uint16Array;
  planFor: PreviewPlanBuilder;
  /** Reused between renders: the 8-bit RGB the engine writes before it is spread to RGBA. */
  rgb: Uint8Array;
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
        const levels = measureFrameLevels(
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
          rgb: new Uint8Array(message.pixels.length),
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
      const { width, height, pixels, rgb } = negative;
      const start = clock();
      const plan = negative.planFor(message.profile);
      const planned = clock();
      const count = width * height;
      applyInversion(plan, pixels, rgb, 0, count);
      const rgba = new Uint8ClampedArray(count * 4);
      for (let p = 0, i = 0, o = 0; p < count; p++, i += 3, o += 4) {
        rgba[o] = rgb[i]!;
        rgba[o + 1] = rgb[i + 1]!;
        rgba[o + 2] = rgb[i + 2]!;
        rgba[o + 3] = 255;
      }
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
