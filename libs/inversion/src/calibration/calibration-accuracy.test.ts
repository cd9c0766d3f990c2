import { describe, expect, it } from 'vitest';
import { deltaE2000 } from '../delta-e';
import { baseFromRegion } from '../film-base';
import { labD50ToLabD65, TINTLINE_400, type FilmStock } from '../forward-model';
import { D65_WHITE, xyzToLab } from '../lab';
import { meteredMidLogExposure } from '../metered-exposure';
import { renderReferenceLinear } from '../reference-linear';
import { LINEAR_SCANNER } from '../scanner-input';
import { linearSrgbToXyz, type Rgb } from '../srgb';
import { buildCalibration, type CalibrationResult } from './build-calibration';
import { calibrationRoll, type CalibrationRoll } from './calibration-roll';
import { fitCharacteristicCurve } from './characteristic-curve-fit';
import { CHART_REFERENCE } from './chart-reference';
import { SPEED_POINT_DENSITY } from './speed-point';
import {
  modelLogExposureAt,
  neutralDensity,
  SPECTRAL_FILM_NORTH,
  SPECTRAL_FILM_SOUTH,
  spectralCalibrationRoll,
  type SpectralFilmModel,
} from './test-film-models';

// Truth throughout: the 24-patch chart's published L*a*b* D50 (McCamy, Marcus & Davidson 1976; the maker's 2016
// values, as in test-data/reference/colour-rendition-chart-24.csv), Bradford-adapted to D65; ΔE00 by CIEDE2000
// (Sharma, Wu & Dalal 2005, checked against their pairs in delta-e's tests).

// The product's own forward model, a stock whose curves bend inside the bracket (as build-calibration.test.ts).
const STOCK: FilmStock = {
  ...TINTLINE_400,
  name: 'Accuracy test 400',
  gamma: [0.55, 0.62, 0.7],
  toe: [-2.1, -2.05, -2.0],
  maxDensity: [2.0, 2.1, 2.2],
  softness: 0.2,
};
/** A bracket from 9 stops under to 8 over in half stops: it reaches the spectral models' speed points. */
const WIDE_BRACKET = Array.from({ length: 35 }, (_, i) => -9 + i / 2);

interface Case {
  name: string;
  roll: (chartStops: number) => CalibrationRoll;
  /** The cyan patch (18) lies outside what the product's forward model records (sRGB sensitivity): left apart. */
  patches: number[];
  /** The model's γ per channel, and where its speed point (ISO 5800) lies. */
  gamma: Rgb;
  speedLogExposure: number;
  /** Which γ of the calibration the model's is compared with. */
  gammaOf: (r: CalibrationResult) => Rgb;
}

const allPatches = CHART_REFERENCE.map((_, i) => i);

function spectralCase(model: SpectralFilmModel): Case {
  const xs = WIDE_BRACKET.map((s) => s * Math.log10(2));
  // The model's γ as the trade measures it, a neutral scale's density in each scanner channel (integral density),
  // its straight part read by the same rule from the model's exact curve at the bracket's exposures.
  const gamma = [0, 1, 2].map(
    (c) =>
      fitCharacteristicCurve(xs.map((x) => ({ logExposure: x, density: neutralDensity(model, x)[c]! })))
        .gamma,
  ) as Rgb;
  const at = modelLogExposureAt(model, SPEED_POINT_DENSITY);
  return {
    name: model.name,
    roll: (chartStops) => spectralCalibrationRoll(model, { chartStops, stops: WIDE_BRACKET }),
    patches: allPatches,
    gamma,
    // ISO 5800: H_M = √(H_G · H_S), H_S the slower of red and blue.
    speedLogExposure: (at[1] + Math.max(at[0], at[2])) / 2,
    gammaOf: (r) => [r.measuredCurves.red.gamma, r.measuredCurves.green.gamma, r.measuredCurves.blue.gamma],
  };
}

const CASES: Case[] = [
  {
    name: 'the product’s forward model',
    roll: (chartStops) => calibrationRoll({ stock: STOCK, scanner: LINEAR_SCANNER, chartStops }),
    patches: allPatches.filter((i) => i !== 17),
    gamma: STOCK.gamma,
    speedLogExposure: Number.NaN,
    gammaOf: (r) => r.gamma,
  },
  spectralCase(SPECTRAL_FILM_NORTH),
  spectralCase(SPECTRAL_FILM_SOUTH),
];

/** ΔE00 of each chart patch rendered by the profile at the metered exposure, the frame printed back by its stops. */
function renderedChartErrors(r: CalibrationResult, roll: CalibrationRoll, stops: number): number[] {
  const neg = roll.chart;
  const params = {
    profile: r.profileDocument,
    scanner: LINEAR_SCANNER,
    base: baseFromRegion(neg, LINEAR_SCANNER, roll.baseRegion).rgb,
    midLogExposure: meteredMidLogExposure(r.profileDocument, { stops }),
    render: 'reference' as const,
    outputBits: 16 as const,
  };
  return CHART_REFERENCE.map((p, i) => {
    const v = renderReferenceLinear(params, neg, [
      (i % 6) * 20 + 5,
      roll.chartRegion[1] + Math.floor(i / 6) * 20 + 5,
      10,
      10,
    ]);
    const mean: Rgb = [0, 0, 0];
    for (let k = 0; k < v.length; k++) mean[k % 3] += v[k]! / (v.length / 3);
    return deltaE2000(xyzToLab(linearSrgbToXyz(mean), D65_WHITE), labD50ToLabD65(p.labD50));
  });
}

const meanOf = (v: number[]) => v.reduce((a, b) => a + b, 0) / v.length;

function calibrate(roll: CalibrationRoll, name: string, more: CalibrationRoll[] = [], stops: number[] = []) {
  return buildCalibration({
    scanner: LINEAR_SCANNER,
    base: baseFromRegion(roll.chart, LINEAR_SCANNER, roll.baseRegion).rgb,
    brackets: roll.brackets.map((b) => ({ image: b.negative, stops: b.stops, region: roll.greyRegion })),
    chart: { image: roll.chart, corners: roll.chartCorners },
    moreCharts: more.map((m, k) => ({ image: m.chart, corners: m.chartCorners, stops: stops[k]! })),
    stock: { name, iso: 200, base: 'clear' },
  });
}

for (const c of CASES) {
  describe(`a profile calibrated on ${c.name}`, () => {
    const roll = c.roll(0);
    const result = calibrate(roll, c.name);

    it('reproduces the chart it was fitted to within mean ΔE00 1 and at most 3, better than before the colour fit', () => {
      expect(result.deltaE.after.mean).toBeLessThanOrEqual(1);
      expect(result.deltaE.after.max).toBeLessThanOrEqual(3);
      expect(result.deltaE.after.mean).toBeLessThan(result.deltaE.before.mean);
    });

    it('predicts each patch from a fit without it within mean ΔE00 1.5, and raises no memorised-chart warning', () => {
      expect(result.deltaE.crossValidated.mean).toBeLessThanOrEqual(1.5);
      expect(result.deltaE.crossValidated.mean).toBeGreaterThanOrEqual(result.deltaE.after.mean - 1e-9);
      expect(result.warnings.map((w) => w.code)).not.toContain('memorised-chart');
    });

    it('keeps the neutral row neutral: |Δa*| and |Δb*| at most 1 on every grey patch', () => {
      expect(result.deltaE.neutral.a).toBeLessThanOrEqual(1);
      expect(result.deltaE.neutral.b).toBeLessThanOrEqual(1);
    });

    it('renders the chart at the metered exposure as the fit reported it', () => {
      const errors = renderedChartErrors(result, roll, 0).filter((_, i) => c.patches.includes(i));
      expect(meanOf(errors)).toBeLessThanOrEqual(1);
    });

    for (const stops of [2, -1])
      it(`renders the chart shot ${stops > 0 ? '+' : ''}${stops} stops, printed back by its exposure, within mean ΔE00 2`, () => {
        const errors = renderedChartErrors(result, c.roll(stops), stops).filter((_, i) =>
          c.patches.includes(i),
        );
        expect(meanOf(errors)).toBeLessThanOrEqual(2);
      });

    it('finds γ within 3 % of the model’s in every channel', () => {
      c.gammaOf(result).forEach((g, k) => expect(Math.abs(g / c.gamma[k]! - 1)).toBeLessThan(0.03));
    });

    if (Number.isFinite(c.speedLogExposure))
      // ISO 5800:1987 speed points, 0.15 above minimum density; the bracket reaches them (no extrapolation).
      it('puts the speed point within a third of a stop of the model’s', () => {
        expect(result.warnings.map((w) => w.code)).not.toContain('speed-point-extrapolated');
        expect(Math.abs(result.speedPoint.logExposure - c.speedLogExposure) / Math.log10(2)).toBeLessThan(
          1 / 3,
        );
      });
  });
}

describe('more chart frames at other exposures', () => {
  it('fits every frame, each printed back by its exposure, and reports what each one gave', () => {
    const c = CASES[2]!;
    const metered = c.roll(0),
      over = c.roll(2),
      under = c.roll(-1);
    const r = calibrate(metered, c.name, [over, under], [2, -1]);
    expect(r.deltaE.frames.map((f) => f.labelledStops)).toEqual([undefined, 2, -1]);
    r.deltaE.frames.forEach((f, k) => {
      expect(f.exposureStops).toBeCloseTo([0, 2, -1][k]!, 1);
      expect(f.patchesUsed).toBe(24);
      expect(f.after.mean).toBeLessThanOrEqual(1);
    });
    expect(r.deltaE.crossValidated.mean).toBeLessThanOrEqual(1.5);
  });
});
