import { validateProfileDocument } from '@clearbase/contracts';
import { describe, expect, it } from 'vitest';
import {
  baseFromRegion,
  D65_WHITE,
  deltaE2000,
  exposeNegative,
  filmDensity,
  invert3,
  invertPixel,
  labD50ToLabD65,
  linearSrgbToXyz,
  multiply3,
  resolveInversion,
  srgbDecode,
  TINTLINE_400,
  xyzToLab,
  type FilmStock,
  type InversionParams,
  type Rgb,
} from '../index';
import { buildCalibration, type CalibrationInput } from './build-calibration';
import { calibrationRoll, type CalibrationRoll, type CalibrationRollOptions } from './calibration-roll';
import { CHART_REFERENCE } from './chart-reference';
import { applyHomography, solveHomography, type Point } from './homography';
import { SPEED_POINT_DENSITY, NOMINAL_SPEED_POINT_DEPTH } from './speed-point';

// An invented stock whose curves bend inside the bracket: a different γ per channel, toe and shoulder,
// a blue-grey tinted base and dye crosstalk.
const STOCK: FilmStock = {
  ...TINTLINE_400,
  name: 'Calibration test 400',
  gamma: [0.55, 0.62, 0.7],
  toe: [-2.1, -2.05, -2.0],
  maxDensity: [2.0, 2.1, 2.2],
  softness: 0.2,
};
// A scanner with a gamma encoding, black level and gains, so linearisation is part of the test.
const SCANNER = {
  name: 'Test scanner',
  encoding: 'gamma' as const,
  gamma: 2.2,
  blackLevel: [0.002, 0.002, 0.003] as Rgb,
  gains: [1.02, 1, 1.05] as Rgb,
};
const LOG2 = Math.log10(2);

function inputFor(roll: CalibrationRoll, labels?: number[]): CalibrationInput {
  return {
    scanner: SCANNER,
    base: baseFromRegion(roll.chart, SCANNER, roll.baseRegion).rgb,
    brackets: roll.brackets.map((b, i) => ({
      image: b.negative,
      stops: labels?.[i] ?? b.stops,
      region: roll.greyRegion,
    })),
    chart: { image: roll.chart, corners: roll.chartCorners },
    stock: { name: STOCK.name, iso: STOCK.iso, base: 'tinted' },
  };
}
const rollOf = (o: Partial<CalibrationRollOptions> = {}) =>
  calibrationRoll({ stock: STOCK, scanner: SCANNER, ...o });

/** Relative log exposure where a raw (crosstalk-mixed) neutral density of the model reaches `target`. */
function modelLogExposureAt(channel: 0 | 1 | 2, target: number): number {
  const mInv = invert3(STOCK.crosstalk);
  const raw = (x: number) =>
    multiply3(mInv, [0, 1, 2].map((c) => filmDensity(STOCK, c as 0 | 1 | 2, x + Math.log10(0.18))) as Rgb)[
      channel
    ];
  let lo = -4,
    hi = 3;
  for (let i = 0; i < 80; i++) {
    const mid = (lo + hi) / 2;
    if (raw(mid) < target) lo = mid;
    else hi = mid;
  }
  return (lo + hi) / 2;
}

describe('building a profile from a calibration roll (forward model: crosstalk, tinted base, curves with toe and shoulder)', () => {
  const roll = rollOf();
  const result = buildCalibration(inputFor(roll));

  it('recovers each channel’s γ within 3 % of the model’s', () => {
    result.gamma.forEach((g, c) => expect(Math.abs(g / STOCK.gamma[c]! - 1)).toBeLessThan(0.03));
  });

  it('finds the toe and the shoulder inside the bracket, around a straight part that holds most of it', () => {
    for (const fit of [result.curves.red, result.curves.green, result.curves.blue]) {
      expect(fit.toe).not.toBeNull();
      expect(fit.shoulder).not.toBeNull();
      expect(fit.toe!.logExposure).toBeLessThan(fit.shoulder!.logExposure);
      expect(fit.straightPart.points).toBeGreaterThanOrEqual(10);
    }
  });

  it('recovers the crosstalk matrix within 0.03 per element, every row summing to 1', () => {
    result.crosstalk.matrix.forEach((row, r) => {
      row.forEach((v, k) => expect(Math.abs(v - STOCK.crosstalk[r]![k]!)).toBeLessThan(0.03));
      expect(row[0] + row[1] + row[2]).toBeCloseTo(1, 10);
    });
  });

  it('reports the chart better after the matrix than before, and no warnings on a good roll', () => {
    expect(result.deltaE.after.mean).toBeLessThan(result.deltaE.before.mean);
    expect(result.deltaE.after.mean).toBeLessThan(1);
    expect(result.deltaE.patches).toHaveLength(24);
    expect(result.warnings.filter((w) => w.severity === 'warning')).toEqual([]);
    expect(Math.abs(result.chartExposureStops)).toBeLessThan(0.05);
  });

  it('produces a profile document that passes the profile schema', () => {
    const checked = validateProfileDocument(result.profileDocument);
    expect(checked.ok).toBe(true);
    expect(result.profileDocument.stock).toEqual({
      name: STOCK.name,
      process: 'C-41',
      base: 'tinted',
      iso: 400,
    });
  });

  // Chart truth: published L*a*b* D50 of the 24-patch chart (McCamy et al. 1976; maker's 2016 values, as in
  // test-data/reference/colour-rendition-chart-24.csv); ΔE00 by CIEDE2000 (Sharma, Wu & Dalal 2005).
  for (const stops of [0, 2]) {
    it(`inverts the chart shot at ${stops ? '+' : ''}${stops} stops with the built profile within mean ΔE00 1.5`, () => {
      const check = rollOf({ chartStops: stops, grain: 0, stops: [0] });
      const neg = check.chart;
      const params: InversionParams = {
        profile: result.profileDocument,
        scanner: SCANNER,
        base: baseFromRegion(neg, SCANNER, check.baseRegion).rgb,
        midLogExposure: neg.truth.midLogExposure,
        render: 'reference',
        outputBits: 16,
      };
      const resolved = resolveInversion(params);
      const size = 20;
      const errors = CHART_REFERENCE.map((p, i) => {
        const x = (i % 6) * size + size / 2,
          y = check.chartRegion[1] + Math.floor(i / 6) * size + size / 2;
        const j = (y * neg.width + x) * 3;
        const code = invertPixel(params, [neg.data[j]!, neg.data[j + 1]!, neg.data[j + 2]!], resolved);
        const lin = code.map((v) => srgbDecode(v / 65535)) as Rgb;
        return deltaE2000(xyzToLab(linearSrgbToXyz(lin), D65_WHITE), labD50ToLabD65(p.labD50));
      });
      // The cyan patch (18) lies outside the sRGB gamut the model's film records; it is held apart.
      const inGamut = errors.filter((_, i) => i !== 17);
      expect(inGamut.reduce((a, b) => a + b, 0) / inGamut.length).toBeLessThanOrEqual(1.5);
    });
  }

  // Speed criterion: ISO 5800:1987 — each layer's point 0.15 above minimum density, H_S the slower of red and
  // blue, H_M = √(H_G·H_S); the nominal depth of the speed point below the metered grey is from memory.
  it('puts the speed point where the model’s green and slower layer reach 0.15 above base (ISO 5800), and EI = ISO × 2^−offset', () => {
    const truth = [0, 1, 2].map((c) => modelLogExposureAt(c as 0 | 1 | 2, SPEED_POINT_DENSITY)) as Rgb;
    const logHm = (truth[1] + Math.max(truth[0], truth[2])) / 2;
    expect(result.speedPoint.logExposure).toBeCloseTo(logHm, 2);
    const offset = (result.speedPoint.logExposure + NOMINAL_SPEED_POINT_DEPTH) / LOG2;
    expect(result.speedPoint.offsetStops).toBeCloseTo(offset, 10);
    expect(result.ei).toBeCloseTo(400 * 2 ** -offset, 6);
  });

  it('moves the speed point by one stop, and doubles the EI, when the film got one stop more at every frame', () => {
    const labels = roll.brackets.map((b) => b.stops);
    const shifted = buildCalibration(inputFor(rollOf({ stops: labels.map((s) => s + 1) }), labels));
    expect((result.speedPoint.logExposure - shifted.speedPoint.logExposure) / LOG2).toBeCloseTo(1, 1);
    expect(shifted.ei / result.ei).toBeGreaterThan(1.95);
    expect(shifted.ei / result.ei).toBeLessThan(2.05);
  });

  it('gives each grey frame a balance, and a spread that grows with the channels’ different γ', () => {
    expect(result.balance.frames).toHaveLength(result.usedFrames.length);
    expect(result.balance.profile).toEqual({ cyanRed: 0, magentaGreen: 0, yellowBlue: 0 });
    // Red is flatter than green and blue steeper: across the bracket the yellow–blue balance drifts most.
    expect(result.spread.range.yellowBlue).toBeGreaterThan(result.spread.range.cyanRed);
    expect(result.spread.range.yellowBlue).toBeGreaterThan(10);
  });
});

describe('a chart frame exposed off the meter', () => {
  it('finds the chart’s exposure from its neutral row and fits the crosstalk as well', () => {
    const r = buildCalibration(inputFor(rollOf({ chartStops: 1.5 })));
    expect(r.chartExposureStops).toBeCloseTo(1.5, 1);
    expect(r.deltaE.after.mean).toBeLessThan(1);
    expect(r.warnings.filter((w) => w.severity === 'warning')).toEqual([]);
  });
});

describe('a chart photographed at an angle', () => {
  it('samples every patch through the perspective grid and fits as well as a square chart', () => {
    const roll = rollOf();
    const src = roll.chart;
    // Warp the square chart onto a tilted, foreshortened quadrilateral (nearest-neighbour resampling),
    // unexposed film around it.
    const corners: Point[] = [
      [30, 20],
      [190, 35],
      [180, 140],
      [40, 150],
    ];
    const toImage = solveHomography(
      [
        [0, 0],
        [6, 0],
        [6, 4],
        [0, 4],
      ],
      corners,
    );
    const toChart = invert3(toImage);
    const width = 220,
      height = 170;
    const data = new Uint16Array(width * height * 3);
    for (let y = 0; y < height; y++)
      for (let x = 0; x < width; x++) {
        const [u, v] = applyHomography(toChart, [x + 0.5, y + 0.5]);
        const inside = u >= 0 && u < 6 && v >= 0 && v < 4;
        const sx = inside ? Math.floor(u * 20) : 0,
          sy = inside ? roll.chartRegion[1] + Math.floor(v * 20) : 0;
        const j = (sy * src.width + sx) * 3;
        data.set(src.data.subarray(j, j + 3), (y * width + x) * 3);
      }
    const input = inputFor(roll);
    const r = buildCalibration({ ...input, chart: { image: { width, height, data }, corners } });
    expect(r.deltaE.after.mean).toBeLessThan(1);
    r.crosstalk.matrix.forEach((row, i) =>
      row.forEach((v, k) => expect(Math.abs(v - STOCK.crosstalk[i]![k]!)).toBeLessThan(0.03)),
    );
    expect(r.grid.patches[0]!.sample.every(([x, y]) => x > 30 && y > 20)).toBe(true);
  });
});

describe('calibration warnings', () => {
  it('warns of too few brackets below 5 usable grey frames', () => {
    const r = buildCalibration(inputFor(rollOf({ stops: [-1, 0, 1, 2] })));
    expect(r.warnings.map((w) => w.code)).toContain('too-few-brackets');
  });

  it('leaves out a clipped grey frame and says which', () => {
    const roll = rollOf();
    const neg = roll.brackets[10]!.negative;
    const [x, y, w, h] = roll.greyRegion;
    for (let yy = y; yy < y + h / 2; yy++)
      neg.data.fill(65535, (yy * neg.width + x) * 3, (yy * neg.width + x + w) * 3);
    const r = buildCalibration(inputFor(roll));
    expect(r.warnings).toContainEqual(expect.objectContaining({ code: 'clipped-frame', frame: 10 }));
    expect(r.usedFrames).not.toContain(10);
  });

  it('flags a blank frame in the middle of the bracket, and only notes thin frames below the toe', () => {
    const roll = rollOf();
    roll.brackets[14]!.negative = exposeNegative(
      { width: 24, height: 24, rgb: new Float32Array(24 * 24 * 3) },
      { stock: STOCK, scanner: SCANNER, rebate: 6 },
    );
    const r = buildCalibration(inputFor(roll));
    expect(r.warnings).toContainEqual(expect.objectContaining({ code: 'blank-frame', frame: 14 }));
    expect(r.warnings.filter((w) => w.code === 'below-toe').every((w) => w.severity === 'notice')).toBe(true);
  });

  it('warns of a non-monotone series and large residuals when the stops are shuffled', () => {
    const roll = rollOf();
    const labels = roll.brackets.map((b) => b.stops);
    [labels[8], labels[20]] = [labels[20]!, labels[8]!];
    const r = buildCalibration(inputFor(roll, labels));
    const codes = r.warnings.map((w) => w.code);
    expect(codes).toContain('non-monotone');
    expect(codes).toContain('large-residuals');
  });

  it('warns of a badly lit chart when its light is warmer than the grey card’s', () => {
    const r = buildCalibration(inputFor(rollOf({ chartLight: [1.25, 1, 0.7] })));
    expect(r.warnings.map((w) => w.code)).toContain('badly-lit-chart');
  });
});
