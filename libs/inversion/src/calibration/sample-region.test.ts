import { describe, expect, it } from 'vitest';
import type { RgbImage } from '../film-base';
import { LINEAR_SCANNER } from '../scanner-input';
import { sampleRegion } from './sample-region';

function flat(width: number, height: number, counts: [number, number, number]): RgbImage {
  const data = new Uint16Array(width * height * 3);
  for (let i = 0; i < width * height; i++) data.set(counts, i * 3);
  return { width, height, data };
}

describe('region sampling', () => {
  it('gives the mean linear light of a flat rectangle', () => {
    const s = sampleRegion(flat(20, 20, [32768, 16384, 6554]), LINEAR_SCANNER, [5, 5, 10, 10]);
    expect(s.rgb[0]).toBeCloseTo(32768 / 65535, 9);
    expect(s.rgb[2]).toBeCloseTo(6554 / 65535, 9);
    expect([s.pixels, s.status]).toEqual([100, 'ok']);
  });

  it('is not moved by dust specks covering under a tenth of the area (trimmed mean)', () => {
    const image = flat(20, 20, [30000, 30000, 30000]);
    for (const i of [22, 57, 91, 123, 188]) image.data.fill(800, i * 3, i * 3 + 3);
    const s = sampleRegion(image, LINEAR_SCANNER, [0, 0, 20, 20]);
    expect(s.rgb[1]).toBeCloseTo(30000 / 65535, 9);
  });

  it('marks a sample clipped when bare light covers more than 1 % of it, and leaves those pixels out', () => {
    const image = flat(10, 10, [20000, 20000, 20000]);
    image.data.fill(65535, 0, 3 * 5);
    const s = sampleRegion(image, LINEAR_SCANNER, [0, 0, 10, 10]);
    expect(s.status).toBe('clipped');
    expect(s.clippedFraction).toBeCloseTo(0.05, 9);
    expect(s.rgb[0]).toBeCloseTo(20000 / 65535, 9);
  });

  it('marks film too dense to read as clipped too', () => {
    const s = sampleRegion(flat(10, 10, [9, 9, 9]), LINEAR_SCANNER, [0, 0, 10, 10]);
    expect(s.status).toBe('empty');
    expect(s.darkFraction).toBe(1);
  });

  it('samples only the pixels whose centres fall inside a polygon', () => {
    const image = flat(10, 10, [10000, 10000, 10000]);
    // Left half brighter: a triangle over the left half sees only those.
    for (let y = 0; y < 10; y++)
      for (let x = 0; x < 5; x++) image.data.fill(40000, (y * 10 + x) * 3, (y * 10 + x) * 3 + 3);
    const s = sampleRegion(image, LINEAR_SCANNER, [
      [0, 0],
      [5, 5],
      [0, 10],
    ]);
    expect(s.rgb[0]).toBeCloseTo(40000 / 65535, 9);
    // Rows of 1 … 5 … 1 centres (centres on an edge count as inside).
    expect(s.pixels).toBe(30);
  });

  it('reads a strided subset of a large area, keeping to the sample budget', () => {
    const s = sampleRegion(flat(200, 100, [12000, 12000, 12000]), LINEAR_SCANNER, [0, 0, 200, 100], {
      maxSamples: 5000,
    });
    // √(20000 / 5000) = 2: every second pixel each way.
    expect(s.pixels).toBe(5000);
    expect(s.rgb[0]).toBeCloseTo(12000 / 65535, 9);
  });

  it('is empty outside the image', () => {
    expect(sampleRegion(flat(4, 4, [1000, 1000, 1000]), LINEAR_SCANNER, [10, 10, 4, 4]).status).toBe('empty');
  });

  it('checks its options before any work', () => {
    expect(() => sampleRegion(flat(4, 4, [1, 1, 1]), LINEAR_SCANNER, [0, 0, 4, 4], { trim: 0.5 })).toThrow(
      'Expected number from 0 to below 0.5 for trim but received 0.5 of type number',
    );
    expect(() => sampleRegion(flat(4, 4, [1, 1, 1]), LINEAR_SCANNER, [0, 0, 4, 4], { step: 0 })).toThrow(
      'Expected integer of at least 1 for step but received 0 of type number',
    );
  });
});
