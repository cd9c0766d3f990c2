import { describe, expect, it } from 'vitest';
import {
  baseBlockLayout,
  baseFromBlocks,
  baseFromRegion,
  detectFilmBase,
  examineBaseBlocks,
  exposeNegative,
  LINEAR_SCANNER,
  outdoorScene,
  POLYCLEAR_200,
  rollBase,
  TINTLINE_400,
  AMBERMASK_100,
  type FilmStock,
  type Rgb,
} from './index';
import { gammaTestScanner } from './test-fixtures';

const scanner = gammaTestScanner;

/** A 320 × 200 frame of `stock` with a 24-pixel rebate, sprocket holes, 60 specks of dust and some grain. */
function stripWithHolesAndDust(stock: FilmStock, seed: number) {
  return exposeNegative(outdoorScene(320, 200), {
    stock,
    scanner,
    rebate: 24,
    sprocketHoles: true,
    dust: 60,
    grain: 0.01,
    seed,
  });
}

describe('film base detection', () => {
  it('finds the same base from blocks examined in parts, joined in row order', () => {
    const neg = stripWithHolesAndDust(TINTLINE_400, 3);
    const { blockRows } = baseBlockLayout(neg);
    const cut = Math.floor(blockRows / 3);
    const parts = [
      examineBaseBlocks(neg, scanner, {}, 0, cut),
      examineBaseBlocks(neg, scanner, {}, cut, 2 * cut),
      examineBaseBlocks(neg, scanner, {}, 2 * cut),
    ];
    expect(parts.every((p) => p.length > 0)).toBe(true);
    expect(baseFromBlocks(parts.flat())).toEqual(detectFilmBase(neg, scanner));
  });
  for (const stock of [POLYCLEAR_200, TINTLINE_400, AMBERMASK_100]) {
    it(`finds the base of ${stock.base} film within 1 % per channel despite sprocket holes, dust and grain`, () => {
      const neg = stripWithHolesAndDust(stock, 7);
      const found = detectFilmBase(neg, scanner);
      found.rgb.forEach((v, c) => expect(Math.abs(v / neg.truth.base[c]! - 1)).toBeLessThan(0.01));
      expect(found.confidence).toBeGreaterThan(0.5);
      const [, y, , h] = found.region;
      expect(y + h <= 24 || y >= neg.height - 24).toBe(true);
    });
  }
  it('finds the base of a 4-megapixel scan from a strided sample, still within 1 % per channel', () => {
    const small = stripWithHolesAndDust(TINTLINE_400, 3);
    // Each pixel of the small negative becomes an 8 × 8 square: 2560 × 1984, holes and dust scaled alike.
    const k = 8;
    const big = {
      width: small.width * k,
      height: small.height * k,
      data: new Uint16Array(small.data.length * k * k),
    };
    for (let y = 0; y < big.height; y++)
      for (let x = 0; x < big.width; x++) {
        const from = (((y / k) | 0) * small.width + ((x / k) | 0)) * 3;
        big.data.set(small.data.subarray(from, from + 3), (y * big.width + x) * 3);
      }
    const found = detectFilmBase(big, scanner);
    found.rgb.forEach((v, c) => expect(Math.abs(v / small.truth.base[c]! - 1)).toBeLessThan(0.01));
    expect(found.confidence).toBeGreaterThan(0.5);
    const drawn = baseFromRegion(big, scanner, [0, 0, big.width, 24 * k]);
    drawn.rgb.forEach((v, c) => expect(Math.abs(v / small.truth.base[c]! - 1)).toBeLessThan(0.01));
  });
  it('ignores clipped bare light even where it covers most of the border', () => {
    const neg = exposeNegative(outdoorScene(160, 100), {
      stock: POLYCLEAR_200,
      scanner: LINEAR_SCANNER,
      rebate: 12,
      sprocketHoles: true,
    });
    // Light past the film edge: the last 20 columns read full scale.
    for (let y = 0; y < neg.height; y++)
      neg.data.fill(65535, (y * neg.width + 140) * 3, (y * neg.width + 160) * 3);
    const found = detectFilmBase(neg, LINEAR_SCANNER);
    found.rgb.forEach((v, c) => expect(Math.abs(v / neg.truth.base[c]! - 1)).toBeLessThan(0.01));
    expect(found.region[0] + found.region[2]).toBeLessThanOrEqual(140);
  });
  it('reports no confidence when there is no film at all', () => {
    const bare = { width: 64, height: 64, data: new Uint16Array(64 * 64 * 3).fill(65535) };
    expect(detectFilmBase(bare, LINEAR_SCANNER).confidence).toBe(0);
  });
  it('samples an operator rectangle, and refuses one outside the image', () => {
    const neg = exposeNegative(outdoorScene(160, 100), {
      stock: TINTLINE_400,
      scanner,
      rebate: 16,
      sprocketHoles: true,
      dust: 10,
    });
    const drawn = baseFromRegion(neg, scanner, [0, 0, 160, 16]);
    drawn.rgb.forEach((v, c) => expect(Math.abs(v / neg.truth.base[c]! - 1)).toBeLessThan(0.01));
    expect(baseFromRegion(neg, scanner, [150, 0, 40, 10]).confidence).toBe(0);
  });
  it('takes the roll base as the per-channel median of usable frames', () => {
    const f = (r: number, g: number, b: number, confidence = 0.9) => ({
      rgb: [r, g, b] as Rgb,
      region: [0, 0, 1, 1] as [number, number, number, number],
      confidence,
    });
    const roll = rollBase([f(0.8, 0.7, 0.6), f(0.82, 0.69, 0.61), f(0.1, 0.1, 0.1, 0), f(0.81, 0.75, 0.59)]);
    expect(roll.rgb).toEqual([0.81, 0.7, 0.6]);
    expect(roll.confidence).toBeCloseTo(0.9, 12);
  });
});
