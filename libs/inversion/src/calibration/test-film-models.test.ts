import { describe, expect, it } from 'vitest';
import { D50_WHITE, labToXyz } from '../lab';
import { CHART_REFERENCE } from './chart-reference';
import {
  CHART_PATCH_SPECTRA,
  layerExposures,
  neutralDensity,
  scannerTransmittance,
  SPECTRAL_FILM_NORTH,
  SPECTRAL_FILM_SOUTH,
} from './test-film-models';
import { cieObserver, reflectanceToXyz, spectrum } from './test-spectra';

describe('the spectral test film models', () => {
  // Truth: the chart's published L*a*b* D50 (McCamy et al. 1976; the maker's 2016 values).
  it('give every chart patch a reflectance spectrum of its published colour, between 0 and 1', () => {
    CHART_PATCH_SPECTRA.forEach((r, i) => {
      const want = labToXyz(CHART_REFERENCE[i]!.labD50, D50_WHITE);
      reflectanceToXyz(r).forEach((v, k) => expect(v).toBeCloseTo(want[k]!, 6));
      expect(Math.min(...r)).toBeGreaterThan(0);
      expect(Math.max(...r)).toBeLessThan(1);
    });
  });

  // CIE 1931 2° observer at its tabulated peaks (CIE 015:2018 tables, values from memory): ȳ(555) = 1.000,
  // x̄(600) = 1.062, z̄(445) = 1.783;
  // the multi-lobe fit (Wyman, Sloan & Shirley 2013) is within a few per cent.
  it('use an observer close to the CIE 1931 standard observer at its peaks', () => {
    expect(cieObserver(555)[1]).toBeCloseTo(1, 1);
    expect(cieObserver(600)[0]).toBeCloseTo(1.062, 1);
    expect(Math.abs(cieObserver(445)[2] / 1.783 - 1)).toBeLessThan(0.05);
  });

  for (const model of [SPECTRAL_FILM_NORTH, SPECTRAL_FILM_SOUTH]) {
    it(`${model.name}: a flat grey exposes every layer alike, and colours mix across the layers`, () => {
      const grey = layerExposures(
        model,
        spectrum(() => 0.18),
      );
      grey.forEach((h) => expect(h).toBeCloseTo(0.18, 12));
      // A pure green patch (14) exposes the red and blue layers too: the layers' sensitivities overlap.
      const green = layerExposures(model, CHART_PATCH_SPECTRA[13]!);
      expect(green[0] / green[1]).toBeGreaterThan(0.1);
    });

    it(`${model.name}: a dye darkens the other channels too, and density rises with exposure`, () => {
      const only = (k: number) => model.fog.map((f, c) => (c === k ? f + 1 : f)) as [number, number, number];
      const clear = scannerTransmittance(model, model.fog);
      const magenta = scannerTransmittance(model, only(1));
      // The magenta dye's unwanted blue absorption, as a density in the blue channel.
      expect(Math.log10(clear[2] / magenta[2])).toBeGreaterThan(0.1);
      const low = neutralDensity(model, -1),
        high = neutralDensity(model, 1);
      high.forEach((d, c) => expect(d).toBeGreaterThan(low[c]!));
    });
  }
});
