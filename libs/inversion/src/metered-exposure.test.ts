import { describe, expect, it } from 'vitest';
import {
  chartScene,
  D65_WHITE,
  exposeNegative,
  labD50ToLabD65,
  linearSrgbToXyz,
  LINEAR_SCANNER,
  POLYCLEAR_200,
  profileForStock,
  renderReferenceLinear,
  xyzToLab,
  type Rgb,
} from './index';
import { meteredMidLogExposure } from './metered-exposure';
import { referenceChartRows } from './test-fixtures';

const profile = profileForStock(POLYCLEAR_200);

/** L*a*b* D65 of the chart's neutral 5 patch (index 22) in a reference rendering at `midLogExposure`. */
function neutralFive(stops: number, midLogExposure: number): Rgb {
  const { scene } = chartScene(referenceChartRows, 16);
  const negative = exposeNegative(scene, {
    stock: POLYCLEAR_200,
    scanner: LINEAR_SCANNER,
    exposureStops: stops,
  });
  const params = {
    profile,
    scanner: LINEAR_SCANNER,
    base: negative.truth.base,
    midLogExposure,
    render: 'reference' as const,
    outputBits: 16 as const,
  };
  const v = renderReferenceLinear(params, negative, [3 * 16 + 4, 3 * 16 + 4, 8, 8]);
  const mean: Rgb = [0, 0, 0];
  for (let i = 0; i < v.length; i++) mean[i % 3] += v[i]! / (v.length / 3);
  return xyzToLab(linearSrgbToXyz(mean), D65_WHITE);
}

describe('rendering at the metered exposure', () => {
  it('puts 18 % grey at log10 0.18 for a film exposed at its box speed', () => {
    expect(meteredMidLogExposure(profile)).toBeCloseTo(Math.log10(0.18), 12);
  });

  // Truth: the chart's published L*a*b* D50 (McCamy et al. 1976; maker's 2016 values, test-data/reference),
  // Bradford-adapted to D65.
  it('prints the chart’s middle grey at its published lightness, with no automatic levels', () => {
    const want = labD50ToLabD65(referenceChartRows[21]!.labD50);
    const got = neutralFive(0, meteredMidLogExposure(profile));
    expect(Math.abs(got[0] - want[0])).toBeLessThan(0.5);
  });

  it('prints a frame shot two stops over back by its exposure', () => {
    const want = labD50ToLabD65(referenceChartRows[21]!.labD50);
    const got = neutralFive(2, meteredMidLogExposure(profile, { stops: 2 }));
    expect(Math.abs(got[0] - want[0])).toBeLessThan(0.5);
  });

  it('takes back the light a roll rated above box speed did not get: EI 400 on an ISO 200 stock is one stop', () => {
    // 1 stop = log10 2 (ISO 5-2 base-10 units).
    expect(
      meteredMidLogExposure(profile, { exposureIndex: 400 }) - meteredMidLogExposure(profile),
    ).toBeCloseTo(-Math.log10(2), 12);
    const want = labD50ToLabD65(referenceChartRows[21]!.labD50);
    const got = neutralFive(-1, meteredMidLogExposure(profile, { exposureIndex: 400 }));
    expect(Math.abs(got[0] - want[0])).toBeLessThan(0.5);
  });

  it('refuses an exposure index that is not above 0 and stops that are not finite', () => {
    expect(() => meteredMidLogExposure(profile, { exposureIndex: 0 })).toThrow(
      'Expected number above 0 for exposureIndex but received 0 of type number',
    );
    expect(() => meteredMidLogExposure(profile, { stops: Number.NaN })).toThrow(
      'Expected finite number for stops but received NaN of type number',
    );
  });
});
