import { describe, expect, it } from 'vitest';
import {
  applyInversion,
  baseFromRegion,
  compileInversion,
  densityLevels,
  detectFilmBase,
  LINEAR_SCANNER,
  NEUTRAL_STOCK,
  rollBase,
  SYNTH_STOCKS,
  synthesizeNegative,
} from './index';

const stock = SYNTH_STOCKS['tidewater-400']!;

describe('film base', () => {
  it('finds the rebate of a synthetic negative within 1 % of the true base, ignoring sprocket holes', () => {
    const neg = synthesizeNegative({ width: 600, height: 400, stock, seed: 3 });
    const base = detectFilmBase(neg);
    for (let c = 0; c < 3; c++) expect(Math.abs(base.rgb[c]! / neg.base[c]! - 1)).toBeLessThan(0.01);
    expect(base.confidence).toBeGreaterThan(0.5);
    const [, y, , h] = base.region;
    const rebateH = neg.rebate[3];
    expect(y + h <= rebateH || y >= 400 - rebateH).toBe(true);
  });

  it('reports zero confidence when every patch is bare light', () => {
    const data = new Uint16Array(100 * 80 * 3).fill(65535);
    expect(detectFilmBase({ width: 100, height: 80, data }).confidence).toBe(0);
  });

  it('samples an operator-drawn rectangle and refuses one outside the image', () => {
    const neg = synthesizeNegative({ width: 300, height: 200, stock, seed: 4 });
    const base = baseFromRegion(neg, [10, 2, 40, 10]);
    expect(Math.abs(base.rgb[1] / neg.base[1] - 1)).toBeLessThan(0.01);
    expect(() => baseFromRegion(neg, [290, 0, 40, 10])).toThrow(/inside the 300 × 200 image/);
  });

  it('takes the roll base as the median of confident frames', () => {
    const f = (g: number, confidence: number) => ({
      rgb: [g, g, g] as [number, number, number],
      region: [0, 0, 1, 1] as [number, number, number, number],
      confidence,
    });
    expect(rollBase([f(0.5, 0.9), f(0.6, 0.9), f(0.55, 0.8), f(0.1, 0.1)]).rgb).toEqual([0.55, 0.55, 0.55]);
  });
});

describe('inversion plan', () => {
  it('turns the negative grey ramp into a positive that gets lighter left to right', () => {
    const neg = synthesizeNegative({ width: 400, height: 200, stock, seed: 5 });
    const base = detectFilmBase(neg);
    const params = {
      stock: { ...NEUTRAL_STOCK, gamma: stock.gamma },
      scanner: LINEAR_SCANNER,
      base: base.rgb,
      render: 'reference' as const,
      output: 'u8' as const,
    };
    const levels = densityLevels(
      compileInversion({ ...params, levels: { shadow: [0, 0, 0], highlight: [1, 1, 1] } }),
      neg.data,
    );
    const plan = compileInversion({ ...params, levels });
    const out = new Uint8Array(neg.data.length);
    applyInversion(plan, neg.data, out, 0, 400 * 200);
    const row = 165; // inside the grey ramp
    const at = (x: number) => out[(row * 400 + x) * 3 + 1]!;
    expect(at(50)).toBeLessThan(at(200));
    expect(at(200)).toBeLessThan(at(390));
    // The ramp is neutral in the scene, so the positive is near neutral after balancing.
    const i = (row * 400 + 300) * 3;
    expect(Math.abs(out[i]! - out[i + 1]!)).toBeLessThan(12);
    expect(Math.abs(out[i + 2]! - out[i + 1]!)).toBeLessThan(12);
  });

  it('plans are structured-cloneable', () => {
    const plan = compileInversion({
      stock: NEUTRAL_STOCK,
      scanner: LINEAR_SCANNER,
      base: [0.9, 0.9, 0.9],
      levels: { shadow: [0.1, 0.1, 0.1], highlight: [1.5, 1.5, 1.5] },
      render: 'print',
      output: 'u16',
    });
    expect(structuredClone(plan)).toEqual(plan);
  });
});

describe('per-channel shortcut', () => {
  it('gives the same pixels as the density path when there is no crosstalk', () => {
    const neg = synthesizeNegative({ width: 120, height: 80, stock, seed: 9 });
    const plan = compileInversion({
      stock: NEUTRAL_STOCK,
      scanner: LINEAR_SCANNER,
      base: neg.base,
      levels: { shadow: [0.05, 0.05, 0.05], highlight: [1.2, 1.3, 1.4] },
      render: 'print',
      output: 'u16',
    });
    expect(plan.directLut).not.toBeNull();
    const fast = new Uint16Array(neg.data.length);
    const slow = new Uint16Array(neg.data.length);
    applyInversion(plan, neg.data, fast, 0, 120 * 80);
    applyInversion({ ...plan, directLut: null }, neg.data, slow, 0, 120 * 80);
    expect(Array.from(fast)).toEqual(Array.from(slow));
  });
});
