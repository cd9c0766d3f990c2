import { describe, expect, it } from 'vitest';
import { labD50ToLinearSrgb } from '../forward-model';
import type { Rgb } from '../srgb';
import { fitCalibration } from './build-calibration';
import { CROSS_VALIDATION_GAP_LIMIT } from './calibration-warning';
import { CHART_REFERENCE } from './chart-reference';
import type { RegionSample } from './sample-region';

const BASE: Rgb = [0.8, 0.7, 0.6];
const sample = (rgb: Rgb): RegionSample => ({
  rgb,
  pixels: 100,
  used: 80,
  clippedFraction: 0,
  darkFraction: 0,
  status: 'ok',
});
// A film with no crosstalk whose three curves are one straight line: D = 0.7 + 0.6·x above base.
const light = (x: Rgb) => BASE.map((b, c) => b * 10 ** -(0.7 + 0.6 * x[c]!)) as Rgb;
const stops = [-3, -2, -1, 0, 1, 2, 3, 4];
const measurements = {
  base: BASE,
  brackets: stops.map((s) => {
    const x = s * Math.log10(2);
    return { stops: s, sample: sample(light([x, x, x])) };
  }),
  chart: CHART_REFERENCE.map((p) =>
    sample(light(labD50ToLinearSrgb(p.labD50).map((v) => Math.log10(Math.max(v, 1e-4) / 0.18)) as Rgb)),
  ),
  stock: { name: 'Straight line 100', iso: 100, base: 'clear' as const },
};

describe('fitting sampled measurements', () => {
  const r = fitCalibration(measurements);

  it('measures density above base as −log10 of the transmittance ratio: a grey at 10 % of the base reads 1.00 (ISO 5-2)', () => {
    // A frame passing exactly 10 % of the base's light, at the exposure where the line reaches 1.00.
    const tenth = { stops: 0.5 / Math.log10(2), sample: sample(BASE.map((b) => 0.1 * b) as Rgb) };
    const fit = fitCalibration({ ...measurements, brackets: [...measurements.brackets, tenth] });
    const point = fit.measuredCurves.green.points.find((p) => Math.abs(p.logExposure - 0.5) < 1e-12);
    expect(point?.density).toBeCloseTo(1, 12);
  });

  it('finds γ 0.6, identity matrices and zero balance spread on a film with parallel straight curves', () => {
    r.gamma.forEach((g) => expect(g).toBeCloseTo(0.6, 9));
    // To 3 decimals: the ΔE00 fit stops where the sRGB matrix's 4-decimal white (IEC 61966-2-1) leaves a residual.
    r.crosstalk.matrix.forEach((row, i) => row.forEach((v, k) => expect(v).toBeCloseTo(i === k ? 1 : 0, 3)));
    r.exposureMatrix.forEach((row, i) => row.forEach((v, k) => expect(v).toBeCloseTo(i === k ? 1 : 0, 3)));
    expect(r.spread.largestRange).toBeCloseTo(0, 6);
    expect(r.chartExposureStops).toBeCloseTo(0, 6);
  });

  it('stores the profile’s curves with 18 % grey at log10 0.18, as the demo profiles do', () => {
    const p = r.profileDocument.curves.green.points.find(
      (q) => Math.abs(q.logExposure - Math.log10(0.18)) < 1e-6,
    );
    expect(p?.density).toBeCloseTo(0.7, 6);
  });

  it('refuses fewer than two usable frames and a chart frame of the wrong size', () => {
    expect(() => fitCalibration({ ...measurements, brackets: measurements.brackets.slice(0, 1) })).toThrow(
      'Expected at least 2 usable grey frames but received 1',
    );
    expect(() => fitCalibration({ ...measurements, chart: measurements.chart.slice(1) })).toThrow(
      'Expected 24 chart samples but received 23',
    );
    expect(() =>
      fitCalibration({ ...measurements, moreCharts: [{ samples: measurements.chart.slice(2), stops: 2 }] }),
    ).toThrow('Expected 24 chart samples for moreCharts[0] but received 22');
  });

  it('warns that the colour fit memorises the chart when patches scatter off the film’s response', () => {
    // Each colour patch off by up to ±0.1 D per channel (seeded): no pair of matrices explains that, so the patches
    // left out are predicted worse than the ones fitted, by more than CROSS_VALIDATION_GAP_LIMIT.
    let seed = 1;
    const scatter = () => ((seed = (seed * 16807) % 2147483647) / 2147483647 - 0.5) * 0.2;
    const chart = CHART_REFERENCE.map((p, i) =>
      sample(
        light(
          labD50ToLinearSrgb(p.labD50).map(
            (v) => Math.log10(Math.max(v, 1e-4) / 0.18) + (i < 18 ? scatter() / 0.6 : 0),
          ) as Rgb,
        ),
      ),
    );
    const fit = fitCalibration({ ...measurements, chart });
    expect(fit.deltaE.crossValidated.mean - fit.deltaE.after.mean).toBeGreaterThan(
      CROSS_VALIDATION_GAP_LIMIT,
    );
    expect(fit.warnings).toContainEqual(
      expect.objectContaining({ code: 'memorised-chart', severity: 'warning' }),
    );
    expect(r.warnings.map((w) => w.code)).not.toContain('memorised-chart');
  });
});
