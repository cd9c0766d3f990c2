import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import {
  AMBERMASK_100,
  applyInversion,
  chartScene,
  compileInversion,
  D65_WHITE,
  deltaE2000,
  exposeNegative,
  gradientScene,
  invertPixel,
  labD50ToLabD65,
  LINEAR_SCANNER,
  linearSrgbToXyz,
  POLYCLEAR_200,
  profileForStock,
  relativeLogExposure,
  renderReferenceLinear,
  resolveInversion,
  srgbDecode,
  TINTLINE_400,
  WIDE_GAMUT_SENSITIVITY,
  xyzToLab,
  type FilmStock,
  type InversionParams,
  type Rgb,
} from './index';
import { gammaTestScanner, mixedTestImage, referenceChartRows, worstCodeDifference } from './test-fixtures';

const scanner = gammaTestScanner;

function paramsFor(
  stock: FilmStock = POLYCLEAR_200,
  base: Rgb,
  mid: number,
  render: 'reference' | 'print' = 'reference',
  outputBits: 8 | 16 = 16,
): InversionParams {
  return { profile: profileForStock(stock), scanner, base, midLogExposure: mid, render, outputBits };
}

describe('chart round trip: published L*a*b* → forward model (tinted base, crosstalk, grain) → reference inversion', () => {
  const { scene, patches } = chartScene(referenceChartRows, 12);
  // A film of wide-gamut sensitivity, so every patch, the cyan outside sRGB included, exposes all three layers.
  const stock = { ...TINTLINE_400, sensitivity: WIDE_GAMUT_SENSITIVITY };
  for (const stops of [-1, 0, 1, 2, 3]) {
    it(`reproduces all 24 patches within mean ΔE00 1.0, max 2.5 at ${stops >= 0 ? '+' : ''}${stops} stops`, () => {
      const neg = exposeNegative(scene, {
        stock,
        scanner,
        exposureStops: stops,
        grain: 0.004,
        seed: 5 + stops,
      });
      const params = paramsFor(stock, neg.truth.base, neg.truth.midLogExposure);
      const errors = patches.map((p) => {
        // The patch's inner 8 × 8 pixels, averaged in linear light (grain averages out, as a meter's spot does).
        const [x, y] = p.rect;
        const lin = renderReferenceLinear(params, neg, [x + 2, y + 2, 8, 8]);
        const mean: Rgb = [0, 0, 0];
        for (let i = 0; i < lin.length; i++) mean[i % 3]! += lin[i]! / 64;
        // Unclipped: the profile names the wide primaries, so the values are linear sRGB (the cyan with red < 0) → XYZ
        // → L*a*b*, never through 8- or 16-bit sRGB codes.
        return deltaE2000(xyzToLab(linearSrgbToXyz(mean), D65_WHITE), labD50ToLabD65(p.labD50));
      });
      // Bounds of the published check: mean ΔE00 ≤ 1.0 and every patch ≤ 2.5.
      expect(errors.reduce((a, b) => a + b, 0) / errors.length).toBeLessThanOrEqual(1);
      expect(Math.max(...errors)).toBeLessThanOrEqual(2.5);
    });
  }
  it('keeps the 23 patches inside sRGB within the same bounds through 16-bit sRGB codes', () => {
    const neg = exposeNegative(scene, { stock: TINTLINE_400, scanner, exposureStops: 1 });
    const params = paramsFor(TINTLINE_400, neg.truth.base, neg.truth.midLogExposure);
    const resolved = resolveInversion(params);
    // The cyan patch (18) lies outside the sRGB gamut (linear red < 0): a film of sRGB sensitivity cannot record it.
    const errors = patches
      .filter((p) => p.index !== 18)
      .map((p) => {
        const [x, y, w, h] = p.rect;
        const i = ((y + h / 2) * neg.width + x + w / 2) * 3;
        const code = invertPixel(params, [neg.data[i]!, neg.data[i + 1]!, neg.data[i + 2]!], resolved);
        const lin = code.map((v) => srgbDecode(v / 65535)) as Rgb;
        return deltaE2000(xyzToLab(linearSrgbToXyz(lin), D65_WHITE), labD50ToLabD65(p.labD50));
      });
    expect(errors.reduce((a, b) => a + b, 0) / errors.length).toBeLessThanOrEqual(1);
    expect(Math.max(...errors)).toBeLessThanOrEqual(2.5);
  });
});

describe('exposure recovery', () => {
  it('moves the recovered log exposure by log10 2 ± 1 % for one stop more on the film', () => {
    const grey = gradientScene(1, 1, 0.18, 0.18);
    const a = exposeNegative(grey, { stock: POLYCLEAR_200, scanner, exposureStops: 0 });
    const b = exposeNegative(grey, { stock: POLYCLEAR_200, scanner, exposureStops: 1 });
    const params = paramsFor(POLYCLEAR_200, a.truth.base, 0);
    const r = resolveInversion(params);
    const ea = relativeLogExposure(r, params, [a.data[0]!, a.data[1]!, a.data[2]!]);
    const eb = relativeLogExposure(r, params, [b.data[0]!, b.data[1]!, b.data[2]!]);
    for (let c = 0; c < 3; c++)
      expect(Math.abs(eb[c]! - ea[c]! - Math.log10(2)) / Math.log10(2)).toBeLessThan(0.01);
  });
  it('keeps a neutral gradient neutral at any exposure (property)', () => {
    fc.assert(
      fc.property(fc.double({ min: -1, max: 3, noNaN: true }), (stops) => {
        const neg = exposeNegative(gradientScene(64, 1, 0.02, 0.9), {
          stock: POLYCLEAR_200,
          scanner,
          exposureStops: stops,
        });
        const params = paramsFor(POLYCLEAR_200, neg.truth.base, neg.truth.midLogExposure, 'print', 8);
        const r = resolveInversion(params);
        for (let x = 0; x < 64; x += 7) {
          const [R, G, B] = invertPixel(
            params,
            [neg.data[3 * x]!, neg.data[3 * x + 1]!, neg.data[3 * x + 2]!],
            r,
          );
          expect(Math.max(R, G, B) - Math.min(R, G, B)).toBeLessThanOrEqual(2);
        }
      }),
      { numRuns: 20 },
    );
  });
});

describe('compiled fast path', () => {
  const input = mixedTestImage();
  for (const [render, bits, saturation] of [
    ['reference', 8, 1],
    ['print', 8, 1],
    ['print', 8, 1.3],
    ['print', 16, 0.8],
    ['reference', 16, 1],
  ] as const) {
    it(`equals the plain per-pixel path within 1 code value (${render}, ${bits}-bit, saturation ${saturation})`, () => {
      const profile = { ...profileForStock(POLYCLEAR_200), saturation };
      const params: InversionParams = {
        profile,
        scanner,
        base: [0.7, 0.68, 0.65],
        midLogExposure: -0.8,
        render,
        outputBits: bits,
      };
      const plan = structuredClone(compileInversion(params));
      // 8-bit with saturation 1 reads rounded codes at the nearest entry; the others interpolate.
      expect(plan.codeLut !== null).toBe(bits === 8 && saturation === 1);
      const pixels = input.length / 3;
      const out = bits === 8 ? new Uint8Array(input.length) : new Uint16Array(input.length);
      applyInversion(plan, input, out, 0, pixels >> 1);
      applyInversion(plan, input, out, pixels >> 1, pixels - (pixels >> 1));
      expect(worstCodeDifference(params, input, out, 3)).toBeLessThanOrEqual(1);
    });
  }
  it('folds a per-channel-only inversion into one table per channel, still within 1 code of the plain path', () => {
    const params: InversionParams = {
      profile: profileForStock(AMBERMASK_100),
      scanner,
      base: [0.5, 0.3, 0.15],
      midLogExposure: -0.7,
      render: 'print',
      outputBits: 16,
    };
    const plan = compileInversion(params);
    expect(plan.directLut).not.toBeNull();
    const out = new Uint16Array(input.length);
    applyInversion(plan, input, out, 0, input.length / 3);
    expect(worstCodeDifference(params, input, out, 5)).toBeLessThanOrEqual(1);
  });
  it('leaves pixels outside the given range untouched', () => {
    const params: InversionParams = {
      profile: profileForStock(POLYCLEAR_200),
      scanner: LINEAR_SCANNER,
      base: [0.8, 0.8, 0.8],
      midLogExposure: -0.7,
      render: 'print',
      outputBits: 8,
    };
    const out = new Uint8Array(30).fill(7);
    applyInversion(compileInversion(params), new Uint16Array(30).fill(20000), out, 2, 3);
    expect([...out.subarray(0, 6)]).toEqual([7, 7, 7, 7, 7, 7]);
    expect([...out.subarray(15)]).toEqual(new Array(15).fill(7));
    expect(out[6]).not.toBe(7);
  });
});
