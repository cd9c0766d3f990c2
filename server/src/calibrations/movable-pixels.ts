import { setImmediate as nextTurn } from 'node:timers/promises';

/**
 * Samples copied per step: 2^22 (8 MB of 16-bit counts), tens of milliseconds on a busy core, so other requests are
 * answered between steps (our choice).
 */
export const COPY_STEP_SAMPLES = 4_194_304;

/**
 * A copy of a frame's counts on a plain ArrayBuffer of its own, made a step at a time with the event loop let run
 * between steps. A decoded frame's counts live in the image library's own memory, which a worker thread cannot take
 * over: handed to `postMessage` they would be copied in one go on the main thread (hundreds of milliseconds at
 * full size). The copy made here can be moved to the thread instead.
 * @example const data = await movablePixels(image.data); await pool.run({ data }, { transferList: [data.buffer] });
 */
export async function movablePixels(data: Uint16Array, step = COPY_STEP_SAMPLES): Promise<Uint16Array> {
  if (!Number.isInteger(step) || step < 1)
    throw new TypeError(`Expected positive integer for step but received ${step} of type ${typeof step}`);
  const out = new Uint16Array(data.length);
  for (let start = 0; start < data.length; start += step) {
    if (start) await nextTurn();
    out.set(data.subarray(start, start + step), start);
  }
  return out;
}
