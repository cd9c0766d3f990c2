import { createHash } from 'node:crypto';
import { validateProfileDocument } from '@clearbase/contracts';
import { describe, expect, it } from 'vitest';
import {
  applyInversion,
  applyPrimaries,
  CAPTURE_PRIMARIES_TO_XYZ,
  chartScene,
  compileInversion,
  D65_WHITE,
  deltaE2000,
  exposeNegative,
  labD50ToLabD65,
  linearSrgbToXyz,
  POLYCLEAR_200,
  profileForStock,
  renderReferenceLinear,
  srgbDecode,
  TINTLINE_400,
  WIDE_GAMUT_SENSITIVITY,
  WIDE_TO_LINEAR_SRGB,
  xyzToLab,
  type InversionParams,
  type InversionProfile,
  type Rgb,
} from './index';
import { gammaTestScanner, mixedTestImage, referenceChartRows, worstCodeDifference } from './test-fixtures';

const scanner = gammaTestScanner;

describe('capture primaries in profile documents', () => {
  it('accepts a document without them, with srgb and with wide, and rejects an unknown name at its path', () => {
    const doc = profileForStock(POLYCLEAR_200);
    expect(doc).not.toHaveProperty('capturePrimaries');
    expect(validateProfileDocument(doc).ok).toBe(true);
    expect(validateProfileDocument({ ...doc, capturePrimaries: 'srgb' }).ok).toBe(true);
    expect(validateProfileDocument({ ...doc, capturePrimaries: 'wide' }).ok).toBe(true);
    const bad = validateProfileDocument({ ...doc, capturePrimaries: 'cinema' });
    expect(bad.ok).toBe(false);
    if (!bad.ok) expect(bad.errors.map((e) => e.path)).toEqual(['capturePrimaries']);
  });
  it('names wide primaries in the profile of a film of wide-gamut sensitivity', () => {
    expect(profileForStock({ ...TINTLINE_400, sensitivity: WIDE_GAMUT_SENSITIVITY }).capturePrimaries).toBe(
      'wide',
    );
  });
  it('keeps white white: each row of the wide → sRGB matrix sums to 1 (same D65 white, ITU-R BT.2087-0)', () => {
    for (const row of WIDE_TO_LINEAR_SRGB) expect(row[0] + row[1] + row[2]).toBeCloseTo(1, 3);
    // The wide primaries' white maps to D65 XYZ: (0.9505, 1, 1.089), IEC 61966-2-1:1999.
    const w = CAPTURE_PRIMARIES_TO_XYZ.wide.map((r) => r[0] + r[1] + r[2]);
    expect(w[0]).toBeCloseTo(0.9505, 3);
    expect(w[1]).toBeCloseTo(1, 3);
    expect(w[2]).toBeCloseTo(1.089, 3);
    expect(applyPrimaries([0.3, 0.3, 0.3], WIDE_TO_LINEAR_SRGB).map((e) => e - 0.3)).toEqual([
      expect.closeTo(0, 3),
      expect.closeTo(0, 3),
      expect.closeTo(0, 3),
    ]);
  });
});

describe('chart round trip on a film of wide-gamut sensitivity', () => {
  const { scene, patches } = chartScene(referenceChartRows, 12);
  const stock = { ...TINTLINE_400, sensitivity: WIDE_GAMUT_SENSITIVITY };
  // A print tone that leaves colour as the scene had it (contrast 1, black 0, white 1), so the chart can be measured.
  const neutralTone = { contrast: 1, blackPoint: 0, whitePoint: 1 };
  const wideProfile: InversionProfile = { ...profileForStock(stock), tone: neutralTone };
  const { capturePrimaries: _named, ...unnamedProfile } = wideProfile;
  const neg = exposeNegative(scene, { stock, scanner, exposureStops: 1 });
  // The cyan patch (18) lies outside sRGB (linear red < 0): an sRGB output cannot hold it.
  const inGamut = patches.filter((p) => p.index !== 18);

  function printErrors(profile: InversionProfile): number[] {
    const params: InversionParams = {
      profile,
      scanner,
      base: neg.truth.base,
      midLogExposure: neg.truth.midLogExposure,
      render: 'print',
      outputBits: 16,
    };
    const plan = compileInversion(params);
    const out = new Uint16Array(neg.data.length);
    applyInversion(plan, neg.data, out, 0, neg.data.length / 3);
    return inGamut.map((p) => {
      const [x, y, w, h] = p.rect;
      const i = ((y + h / 2) * neg.width + x + w / 2) * 3;
      const lin = [0, 1, 2].map((c) => srgbDecode(out[i + c]! / 65535)) as Rgb;
      return deltaE2000(xyzToLab(linearSrgbToXyz(lin), D65_WHITE), labD50ToLabD65(p.labD50));
    });
  }

  it('renders the 23 patches inside sRGB in print rendering within mean ΔE00 1.0, max 2.5, through 16-bit sRGB codes', () => {
    const errors = printErrors(wideProfile);
    // Bounds of the published check: mean ΔE00 ≤ 1.0 and every patch ≤ 2.5.
    expect(errors.reduce((a, b) => a + b, 0) / errors.length).toBeLessThanOrEqual(1);
    expect(Math.max(...errors)).toBeLessThanOrEqual(2.5);
  });
  it('misses those bounds when the profile does not name the wide primaries (the colours come out too saturated)', () => {
    const errors = printErrors(unnamedProfile);
    expect(Math.max(...errors)).toBeGreaterThan(2.5);
  });
  it('gives linear sRGB from the reference rendering, the cyan outside sRGB with its negative red kept', () => {
    const params: InversionParams = {
      profile: wideProfile,
      scanner,
      base: neg.truth.base,
      midLogExposure: neg.truth.midLogExposure,
      render: 'reference',
      outputBits: 16,
    };
    const cyan = patches.find((p) => p.index === 18)!;
    const lin = renderReferenceLinear(params, neg, [cyan.rect[0] + 4, cyan.rect[1] + 4, 1, 1]);
    expect(lin[0]).toBeLessThan(0);
    const lab = xyzToLab(linearSrgbToXyz([lin[0]!, lin[1]!, lin[2]!]), D65_WHITE);
    expect(deltaE2000(lab, labD50ToLabD65(cyan.labD50))).toBeLessThanOrEqual(2.5);
  });
});

describe('compiled fast path with wide capture primaries', () => {
  const input = mixedTestImage();
  for (const [render, bits, saturation] of [
    ['reference', 8, 1],
    ['print', 8, 1.3],
    ['print', 16, 0.8],
    ['reference', 16, 1],
  ] as const) {
    it(`equals the plain per-pixel path within 1 code value (${render}, ${bits}-bit, saturation ${saturation})`, () => {
      const profile = { ...profileForStock(POLYCLEAR_200), saturation, capturePrimaries: 'wide' as const };
      const params: InversionParams = {
        profile,
        scanner,
        base: [0.7, 0.68, 0.65],
        midLogExposure: -0.8,
        render,
        outputBits: bits,
      };
      const plan = structuredClone(compileInversion(params));
      expect(plan.directLut).toBeNull();
      expect(plan.foldedLut).toBeNull();
      const pixels = input.length / 3;
      const out = bits === 8 ? new Uint8Array(input.length) : new Uint16Array(input.length);
      applyInversion(plan, input, out, 0, pixels >> 1);
      applyInversion(plan, input, out, pixels >> 1, pixels - (pixels >> 1));
      expect(worstCodeDifference(params, input, out, 3)).toBeLessThanOrEqual(1);
    });
  }
});

describe('older documents', () => {
  // SHA-256 of the outputs the engine gave before profiles could name capture primaries (same image, params). The
  // 8-bit one with saturation 1 is from after 8-bit plans read rounded codes at the nearest table entry (within one
  // code of the plain path, as inversion.test.ts checks); it still must not move with the field.
  const before = [
    [POLYCLEAR_200, 'reference', 8, 1, '9b32b8ea57261cef64458974785635d297dbb4dc8d3b717f552106815e414ed9'],
    [POLYCLEAR_200, 'print', 8, 1.3, 'a5abea56d36cec4c22e7f79ee5c004fac25cd38bf6f23bea60681cadc9759e59'],
    [TINTLINE_400, 'print', 16, 1, '0a87dc58ce143a22422bceafa944b955b5dca4d83529ea5b04865e909c137e0d'],
    [TINTLINE_400, 'print', 16, 0.8, '37b44daaf39714bdb799011e85d11831f152709aa89b5724744e575cf59bce13'],
  ] as const;
  const input = mixedTestImage();
  for (const [stock, render, bits, saturation, hash] of before) {
    it(`render byte-identical without the field and with 'srgb' (${stock.name}, ${render}, ${bits}-bit, saturation ${saturation})`, () => {
      const doc = { ...profileForStock(stock), saturation };
      for (const profile of [doc, { ...doc, capturePrimaries: 'srgb' as const }]) {
        const params: InversionParams = {
          profile,
          scanner,
          base: [0.7, 0.68, 0.65],
          midLogExposure: -0.8,
          render,
          outputBits: bits,
        };
        const out = bits === 8 ? new Uint8Array(input.length) : new Uint16Array(input.length);
        applyInversion(compileInversion(params), input, out, 0, input.length / 3);
        expect(createHash('sha256').update(new Uint8Array(out.buffer)).digest('hex')).toBe(hash);
      }
    });
  }
});
