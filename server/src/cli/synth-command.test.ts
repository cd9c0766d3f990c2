import { describe, expect, it } from 'vitest';
import {
  CHART_REFERENCE,
  labD50ToLinearSrgb,
  LINEAR_SCANNER,
  MID_GREY,
  sceneLinearPixel,
  TINTLINE_400,
  profileForStock,
} from '@clearbase/inversion';
import { demoNegative, sceneOfSize, SYNTH_SCENES } from './synth-command';

describe('synth scenes', () => {
  it('makes every scene at exactly the asked size', () => {
    for (const scene of SYNTH_SCENES) {
      const s = sceneOfSize(scene, 301, 157);
      expect([s.width, s.height, s.rgb.length]).toEqual([301, 157, 301 * 157 * 3]);
    }
  });

  it('lays the 24-patch chart out from its published values, centred on mid grey', () => {
    const s = sceneOfSize('chart', 620, 400);
    // Patches of 100 px (400 / 4), the chart 600 wide, 10 px of surround each side.
    const at = (x: number, y: number) => Array.from(s.rgb.subarray((y * 620 + x) * 3, (y * 620 + x) * 3 + 3));
    expect(at(2, 200)).toEqual([MID_GREY, MID_GREY, MID_GREY].map(Math.fround));
    CHART_REFERENCE.forEach((patch, i) => {
      const x = 10 + (i % 6) * 100 + 50,
        y = Math.floor(i / 6) * 100 + 50;
      at(x, y).forEach((v, c) => expect(v).toBeCloseTo(labD50ToLinearSrgb(patch.labD50)[c]!, 6));
    });
  });

  it('writes grey steps that invert to a neutral staircase, lighter step by step', () => {
    const neg = demoNegative({ width: 330, height: 120, stock: TINTLINE_400, scene: 'grey-steps', seed: 2 });
    const params = {
      profile: profileForStock(TINTLINE_400),
      scanner: LINEAR_SCANNER,
      base: neg.truth.base,
      midLogExposure: neg.truth.midLogExposure,
      render: 'reference' as const,
      outputBits: 16 as const,
    };
    const y = neg.truth.frame[1] + (neg.truth.frame[3] >> 1);
    const steps = Array.from({ length: 11 }, (_, k) => {
      const i = (y * neg.width + k * 30 + 15) * 3;
      return sceneLinearPixel(params, [neg.data[i]!, neg.data[i + 1]!, neg.data[i + 2]!]);
    });
    for (let k = 1; k < steps.length; k++) expect(steps[k]![1]).toBeGreaterThan(steps[k - 1]![1]);
    // 3 % and 90 % reflectance, within the grain of one pixel.
    expect(steps[0]![1]).toBeCloseTo(0.03, 2);
    expect(steps[10]![1] / 0.9).toBeCloseTo(1, 1);
    for (const rgb of steps) expect(Math.max(...rgb) / Math.min(...rgb)).toBeLessThan(1.06);
  });
});
