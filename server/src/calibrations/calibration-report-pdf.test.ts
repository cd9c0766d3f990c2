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
  it('is four pages when the warnings fit on the first', async () => {
    const pdf = await reportOf(calibration);
    expect(pageCount(pdf)).toBe(4);
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
    expect(pageCount(pdf)).toBeGreaterThan(4);
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

  it('gives the training and cross-validated ΔE00, the neutral row, the chart frame and both matrices', async () => {
    const text = textOf(await reportOf(calibration));
    const e = calibration.fit.deltaE;
    expect(text).toContain(
      `Training (the patches the fit saw): mean ${e.after.mean!.toFixed(2)}, max ${e.after.max!.toFixed(2)}`,
    );
    expect(text).toContain(
      `Cross-validated (each patch by a fit without it): mean ${e.crossValidated!.mean!.toFixed(2)}, max ${e.crossValidated!.max!.toFixed(2)}`,
    );
    expect(text).toContain(`Density only, no colour matrix: mean ${e.before.mean!.toFixed(2)}`);
    expect(text).toContain(`a*| ${e.neutral!.a.toFixed(2)}`);
    expect(text).toContain(`Chart frame 1: exposure`);
    const rowOf = (row: readonly number[]) => row.map((v) => v.toFixed(4).padStart(8)).join('   ');
    for (const row of calibration.fit.crosstalk) expect(text).toContain(rowOf(row));
    for (const row of calibration.fit.exposureMatrix!) expect(text).toContain(rowOf(row));
    expect(text).toContain('E00 cross-val.');
    for (const p of e.patches.filter((q) => q.deltaECrossValidated !== null))
      expect(text).toContain(p.deltaECrossValidated!.toFixed(2));
  });

  it('says when the colour fit memorises the chart', async () => {
    const memorised = {
      ...calibration,
      fit: { ...calibration.fit, deltaE: { ...calibration.fit.deltaE, memorisedChart: true } },
    };
    expect(textOf(await reportOf(memorised))).toContain('the colour fit memorises the chart');
    expect(textOf(await reportOf(calibration))).not.toContain('the colour fit memorises the chart');
  });

  it('joins every measured patch to its result in the a*b* plane, on a last page of its own', async () => {
    const pdf = await reportOf(calibration);
    const text = textOf(pdf);
    expect(text).toContain('Chart patches in the a*b* plane: published colour against the result');
    expect(text.lastIndexOf('a* (green')).toBeGreaterThan(text.indexOf('Mean over in-gamut patches'));
    // the joining lines are the report's only strokes in mid grey (#555555)
    const joins = pdf.match(/0\.3333333333333333 0\.3333333333333333 0\.3333333333333333 SCN/g)?.length ?? 0;
    expect(joins).toBe(calibration.fit.deltaE.patches.filter((p) => p.after).length);
    expect(Math.max(...rectangleBottoms(pdf))).toBeLessThanOrEqual(pageHeight - margin);
  });

  it('writes a calibration kept before the cross-validated figures, marking them absent', async () => {
    const older: Calibration = {
      ...calibration,
      fit: {
        ...calibration.fit,
        exposureMatrix: null,
        deltaE: {
          ...calibration.fit.deltaE,
          patches: calibration.fit.deltaE.patches.map((p) => ({
            ...p,
            crossValidated: null,
            deltaECrossValidated: null,
          })),
          crossValidated: null,
          neutral: null,
          frames: [],
          memorisedChart: false,
        },
      },
    };
    const pdf = await reportOf(older);
    expect(pageCount(pdf)).toBe(4);
    const text = textOf(pdf);
    expect(text).toContain('Not kept in this calibration.');
    // absent figures are written as a dash, never as a number
    expect(text).toMatch(/Cross-validated \(each patch by a fit without it\): mean \D*, max \D*Neutral row/);
    expect(text).not.toContain('Chart frame 1');
  });
});
