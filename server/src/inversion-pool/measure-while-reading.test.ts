import { mkdtemp, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import {
  detectFilmBase,
  LINEAR_SCANNER,
  measureFrameLevels,
  profileForStock,
  TINTLINE_400,
} from '@clearbase/inversion';
import { demoNegative, writeNegativeTiff } from '../cli/synth-command';
import { readNegative } from '../imaging/index';
import { measureWhileReading } from './measure-while-reading';

let dir: string;
beforeAll(async () => {
  dir = await mkdtemp(join(tmpdir(), 'clearbase-measure-reading-'));
});
afterAll(async () => {
  await rm(dir, { recursive: true, force: true });
});

describe('measuring a frame while it is read', () => {
  it('gives the same base and the same levels as measuring the whole frame afterwards', async () => {
    // 900 × 600: 5400 bytes a row, so the copy comes in bands of 194 rows, and blocks of 15 rows straddle them.
    const neg = demoNegative({ width: 900, height: 600, stock: TINTLINE_400, seed: 5 });
    const file = join(dir, 'frame.tif');
    await writeNegativeTiff(file, neg.data, neg.width, neg.height);
    const reading = measureWhileReading(LINEAR_SCANNER, { detectBase: true, sampleLevels: true });
    let bands = 0;
    const frame = await readNegative(file, {
      shared: true,
      onRows: (f, endRow) => {
        bands++;
        reading.onRows(f, endRow);
      },
    });
    expect(bands).toBe(4);
    const base = reading.base();
    expect(base).toEqual(detectFilmBase(frame, LINEAR_SCANNER));
    expect(base.confidence).toBeGreaterThan(0.5);
    const params = {
      profile: profileForStock(TINTLINE_400),
      scanner: LINEAR_SCANNER,
      base: base.rgb,
      render: 'print' as const,
      outputBits: 8 as const,
    };
    expect(measureFrameLevels(params, reading.levelSample(), { step: 1 })).toEqual(
      measureFrameLevels(params, frame),
    );
  });

  it('refuses to give a base or a sample before the frame is in, or one it was not asked for', () => {
    const reading = measureWhileReading(LINEAR_SCANNER, { detectBase: false, sampleLevels: true });
    expect(() => reading.levelSample()).toThrow(RangeError);
    const data = new Uint16Array(40 * 30 * 3).fill(30000);
    reading.onRows({ width: 40, height: 30, data }, 10);
    expect(() => reading.levelSample()).toThrow(RangeError);
    reading.onRows({ width: 40, height: 30, data }, 30);
    expect(reading.levelSample().width).toBe(40);
    expect(() => reading.base()).toThrow(RangeError);
  });
});
