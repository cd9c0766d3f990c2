import type { ScannerProfile } from '@clearbase/contracts';
import {
  compileInversion,
  resolveInversion,
  type InversionParams,
  type InversionPlan,
  type InversionProfile,
  type Rgb,
} from '@clearbase/inversion';

/**
 * Entries of the preview's log exposure → 8-bit code table over the relative range (9 log units): a step of 0.0003
 * log E moves an 8-bit code by far less than one, so linear interpolation stays within a code of the full table.
 */
const PREVIEW_OUTPUT_LUT_SIZE = 32768;

/** Builds inversion plans for one negative as its profile changes. */
export type PreviewPlanBuilder = (profile: InversionProfile) => InversionPlan;

/**
 * Plans for one negative (scanner, base and E_mid fixed), rebuilding only what a change touches: the density table
 * is made once; each channel's curve inverse is kept per set of control points, so a change of balance only shifts
 * tables; the output table is kept per tone. Renders the same as `compileInversion` within one 8-bit code.
 * @example const planFor = createPreviewPlanBuilder(LINEAR_SCANNER, base, -0.72); applyInversion(planFor(profile), pixels, out, 0, n);
 */
export function createPreviewPlanBuilder(
  scanner: ScannerProfile,
  base: Rgb,
  midLogExposure: number,
): PreviewPlanBuilder {
  let template: InversionPlan | null = null;
  const inverseTables = new Map<string, Float32Array>();
  const outputTables = new Map<string, Float32Array>();
  const paramsFor = (profile: InversionProfile): InversionParams => ({
    profile,
    scanner,
    base,
    midLogExposure,
    render: 'print',
    outputBits: 8,
  });

  return (profile) => {
    const params = paramsFor(profile);
    // the first plan comes whole from the engine; its density table and table sizes serve every later plan
    template ??= compileInversion(params);
    const resolved = resolveInversion(params);
    const {
      exposureLutSize: n,
      densityMin: dMin,
      densityMax: dMax,
      relativeMin: rMin,
      relativeMax: rMax,
    } = template;
    const exposureLut = new Float32Array(3 * n);
    (['red', 'green', 'blue'] as const).forEach((channel, c) => {
      const key = JSON.stringify(profile.curves[channel].points);
      let inverse = inverseTables.get(key);
      if (!inverse) {
        inverse = new Float32Array(n);
        const curve = resolved.curves[c]!;
        for (let i = 0; i < n; i++) inverse[i] = curve.inverse(dMin + ((dMax - dMin) * i) / (n - 1));
        inverseTables.set(key, inverse);
      }
      const offset = resolved.offset[c]!;
      for (let i = 0; i < n; i++) {
        const e = inverse[i]! + offset;
        exposureLut[c * n + i] = e < rMin ? rMin : e > rMax ? rMax : e;
      }
    });
    const toneKey = JSON.stringify(profile.tone);
    let outputLut = outputTables.get(toneKey);
    if (!outputLut) {
      outputLut = new Float32Array(PREVIEW_OUTPUT_LUT_SIZE);
      for (let i = 0; i < PREVIEW_OUTPUT_LUT_SIZE; i++)
        outputLut[i] = resolved.encode(rMin + ((rMax - rMin) * i) / (PREVIEW_OUTPUT_LUT_SIZE - 1));
      outputTables.set(toneKey, outputLut);
    }
    const m = profile.crosstalk;
    const identity = m.every((row, r) => row.every((x, k) => x === (r === k ? 1 : 0)));
    return {
      ...template,
      crosstalk: identity ? null : Float32Array.from(m.flat()),
      exposureLut,
      primaries: resolved.primaries ? Float64Array.from(resolved.primaries.flat()) : null,
      saturation: resolved.saturation,
      outputLut,
      outputLutSize: PREVIEW_OUTPUT_LUT_SIZE,
      directLut: null,
      // the template's composed table describes the template's own tables, not these
      foldedLut: null,
      codeLut: null,
    };
  };
}
