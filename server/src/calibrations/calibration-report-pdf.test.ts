import type { Calibration, CalibrationWarning } from '@clearbase/contracts';
import {
  calibrationRoll,
  CHART_REFERENCE,
  chartGridFromCorners,
  detectFilmBase,
  fitCalibration,
  LINEAR_SCANNER,
  rollBase,
  sampleRegion,
  TINTLINE_400,
} from '@clearbase/inversion';
import { Writable } from 'node:stream';
import { beforeAll, describe, expect, it } from 'vitest';
import { writeCalibrationReport } from './calibration-report-pdf';
import { describeFit, residualsOf } from './describe-fit';

// A4 height and the report's margin, in points, as the report sets them (ISO 216 at 72 pt per inch)
const pageHeight = 841.89;
const margin = 48;

let calibration: Calibration;

/** The report's bytes, uncompressed so its drawing operators can be read. */
async function reportOf(c: Calibration): Promise<string> {
  const chunks: Buffer[] = [];
  const sink = new Writable({
    write(chunk: Buffer, _encoding, done) {
      chunks.push(chunk);
      done();
    },
  });
  await writeCalibrationReport(c, sink, { compress: false });
  return Buffer.concat(chunks).toString('latin1');
}

const pageCount = (pdf: string) => pdf.match(/\/Type \/Page\b(?!s)/g)?.length ?? 0;

/** The baseline of every piece of text, in PDF units from the page's bottom edge (pdfkit places text with Tm). */
const textBaselines = (pdf: string) =>
  [...pdf.matchAll(/1 0 0 1 (-?[\d.]+) (-?[\d.]+) Tm/g)].map((m) => Number(m[2]));

/** The bottom edge of every rectangle, top-down from the page's top (pdfkit draws in a flipped space). */
const rectangleBottoms = (pdf: string) =>
  [...pdf.matchAll(/(-?[\d.]+) (-?[\d.]+) (-?[\d.]+) (-?[\d.]+) re/g)].map(
    (m) => Number(m[2]) + Number(m[4]),
  );

/** The text drawn, decoded from pdfkit's hex strings. */
const textOf = (pdf: string) =>
  [...pdf.matchAll(/<([0-9a-f]+)>/g)].map((m) => Buffer.from(m[1]!, 'hex').toString('latin1')).join('');

beforeAll(() => {
  const roll = calibrationRoll({ stock: TINTLINE_400, scanner: LINEAR_SCANNER });
  const samples = roll.brackets.map((b) => ({
    stops: b.stops,
    sample: sampleRegion(b.negative, LINEAR_SCANNER, roll.greyRegion),
  }));
  const grid = chartGridFromCorners(roll.chartCorners);
  const base = rollBase(
    [...roll.brackets.map((b) => b.negative), roll.chart].map((n) => detectFilmBase(n, LINEAR_SCANNER)),
  );
  const result = fitCalibration({
    base: base.rgb,
    brackets: samples,
    chart: grid.patches.map((p) => sampleRegion(roll.chart, LINEAR_SCANNER, p.sample)),
    stock: { name: 'Report test 400', iso: 400, base: 'tinted' },
    reference: CHART_REFERENCE,
  });
  calibration = {
    id: 12,
    stockId: 3,
    stockName: 'Report test 400',
    scannerId: null,
    profileId: 4,
    profileVersionId: 9,
    gamma: result.gamma,
    ei: result.ei,
    meanDeltaE: result.deltaE.after.mean,
    warningCount: 0,
    createdAt: '2026-03-01T08:00:00.000Z',
    createdBy: 1,
    createdByName: 'Pell Arden',
    inputs: {
      frames: [],
      greyRegion: { x: 0, y: 0, width: 1, height: 1 },
      chartCorners: null,
      chartRegion: null,
      baseRegion: null,
    },
    fit: describeFit(result, samples, base.rgb, 'frames', 400, 0),
    residuals: residualsOf(result),
    warnings: [],
  };
});

describe('calibration report PDF', () => {
  it('is three pages when the warnings fit on the first', async () => {
    const pdf = await reportOf(calibration);
    expect(pageCount(pdf)).toBe(3);
    expect(textOf(pdf)).toContain('None.');
  });

  it('runs a long list of warnings onto further pages, every one of them written, nothing below the bottom margin', async () => {
    const warnings: CalibrationWarning[] = Array.from({ length: 60 }, (_, i) => ({
      code: 'clipped-frame',
      severity: i % 3 ? 'notice' : 'warning',
      message: `Grey frame ${i + 1} has clipped highlights in the blue layer; its densities were left out of the fit, so the shoulder of the curve rests on fewer frames than the bracket holds (number ${i + 1}).`,
      frame: i,
    }));
    const pdf = await reportOf({ ...calibration, warnings, warningCount: 20 });
    expect(pageCount(pdf)).toBeGreaterThan(3);
    const text = textOf(pdf);
    for (let i = 1; i <= 60; i++) expect(text).toContain(`(number ${i}).`);
    expect(text).toContain('Warnings (60), continued');
    // the curves and the patch table still come after the warnings, each whole
    expect(text.indexOf('(number 60).')).toBeLessThan(text.indexOf('Characteristic curves: density'));
    expect(text).toContain('Mean over in-gamut patches');

    const baselines = textBaselines(pdf);
    expect(baselines.length).toBeGreaterThan(100);
    expect(Math.min(...baselines)).toBeGreaterThanOrEqual(margin);
    expect(Math.max(...rectangleBottoms(pdf))).toBeLessThanOrEqual(pageHeight - margin);
  });

  it('keeps the patch table and its swatches above the bottom margin', async () => {
    const pdf = await reportOf(calibration);
    expect(Math.min(...textBaselines(pdf))).toBeGreaterThanOrEqual(margin);
    expect(Math.max(...rectangleBottoms(pdf))).toBeLessThanOrEqual(pageHeight - margin);
  });
});
