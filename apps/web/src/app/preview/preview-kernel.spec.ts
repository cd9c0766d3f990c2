import {
  applyInversion,
  compileInversion,
  exposeNegative,
  LINEAR_SCANNER,
  outdoorScene,
  TINTLINE_400,
  profileForStock,
  type InversionProfile,
} from '@clearbase/inversion';
import { quantiseDensities, renderQuantised } from './preview-kernel';

const negative = exposeNegative(outdoorScene(60, 40), {
  stock: TINTLINE_400,
  scanner: LINEAR_SCANNER,
  grain: 0.01,
});
const pixels = negative.width * negative.height;

/** The largest difference in any channel between the preview kernel and the engine's own pixel loop. */
function worstDifference(profile: InversionProfile): number {
  const plan = compileInversion({
    profile,
    scanner: LINEAR_SCANNER,
    base: negative.truth.base,
    midLogExposure: -0.7,
    render: 'print',
    outputBits: 8,
  });
  const engines = new Uint8Array(negative.data.length);
  applyInversion(plan, negative.data, engines, 0, pixels);
  const rgba = new Uint8ClampedArray(pixels * 4);
  renderQuantised(plan, quantiseDensities(plan, negative.data, pixels), rgba, pixels);
  let worst = 0;
  for (let p = 0; p < pixels; p++) {
    for (let c = 0; c < 3; c++) worst = Math.max(worst, Math.abs(rgba[p * 4 + c]! - engines[p * 3 + c]!));
    expect(rgba[p * 4 + 3]).toBe(255);
  }
  return worst;
}

describe('the preview kernel', () => {
  it('renders as the engine does within one code when saturation folds away', () => {
    expect(worstDifference({ ...profileForStock(TINTLINE_400), saturation: 1 })).toBeLessThanOrEqual(1);
  });

  it('renders as the engine does within one code with saturation mixed per pixel', () => {
    const profile = {
      ...profileForStock(TINTLINE_400),
      saturation: 1.3,
      balance: { cyanRed: -4, magentaGreen: 6, yellowBlue: 2 },
    };
    expect(worstDifference(profile)).toBeLessThanOrEqual(1);
  });

  it('renders a film recorded in wide primaries as the engine does, within one code', () => {
    const profile: InversionProfile = {
      ...profileForStock(TINTLINE_400),
      capturePrimaries: 'wide',
      saturation: 1.2,
    };
    expect(worstDifference(profile)).toBeLessThanOrEqual(1);
  });
});
