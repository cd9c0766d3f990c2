import type { CalibrationFit } from '@clearbase/contracts';
import type PDFDocument from 'pdfkit';

type Doc = InstanceType<typeof PDFDocument>;

/** Where the plot goes on the page, points. */
export interface PlotBox {
  x: number;
  y: number;
  size: number;
}

// grid every 10 units of a*/b* up to ±60, every 20 beyond (our choice: a chart's patches reach about ±70)
const gridStep = (half: number) => (half > 60 ? 20 : 10);

/**
 * Draws the chart's patches in the a*b* plane (D65) into a square `box`: each measured patch's published colour as a
 * filled dot in its own colour with its number, the profile's result as a ring in the result's colour, a line joining
 * the two (its length is the chromatic part of the error), and, where the calibration kept it, the leave-one-out
 * prediction as a small cross. The axes are symmetric about the neutral point, wide enough for every point, in steps
 * of 10. Draws nothing outside `box` but its axis labels (within 24 points below and left of it).
 *
 * @example
 * abPlanePlot(doc, calibration.fit.deltaE.patches, { x: 78, y: 90, size: 440 });
 */
export function abPlanePlot(doc: Doc, patches: CalibrationFit['deltaE']['patches'], box: PlotBox): void {
  const values = patches.flatMap((p) => [
    p.reference[1],
    p.reference[2],
    ...(p.after ? [p.after[1], p.after[2]] : []),
    ...(p.crossValidated ? [p.crossValidated[1], p.crossValidated[2]] : []),
  ]);
  const largest = Math.max(20, ...values.filter(Number.isFinite).map(Math.abs));
  const step = gridStep(largest);
  const half = Math.ceil((largest + 2) / step) * step;
  const px = (a: number) => box.x + ((a + half) / (2 * half)) * box.size;
  const py = (b: number) => box.y + box.size - ((b + half) / (2 * half)) * box.size;
  const label = (text: string, x: number, y: number, size = 7) =>
    doc.font('Helvetica').fontSize(size).fillColor('#444444').text(text, x, y, { lineBreak: false });

  doc.lineWidth(0.3).strokeColor('#cccccc');
  for (let v = -half; v <= half + 1e-9; v += step) {
    doc
      .moveTo(px(v), box.y)
      .lineTo(px(v), box.y + box.size)
      .stroke();
    doc
      .moveTo(box.x, py(v))
      .lineTo(box.x + box.size, py(v))
      .stroke();
    label(String(v), px(v) - 6, box.y + box.size + 4);
    label(String(v), box.x - 20, py(v) - 3);
  }
  doc.lineWidth(0.7).strokeColor('#888888');
  doc
    .moveTo(px(0), box.y)
    .lineTo(px(0), box.y + box.size)
    .stroke();
  doc
    .moveTo(box.x, py(0))
    .lineTo(box.x + box.size, py(0))
    .stroke();
  doc.lineWidth(0.8).strokeColor('#000000').rect(box.x, box.y, box.size, box.size).stroke();
  label('a* (green – red)', box.x + box.size / 2 - 30, box.y + box.size + 14, 8);
  label('b*', box.x - 20, box.y - 12, 8);

  for (const p of patches) {
    const [ra, rb] = [px(p.reference[1]), py(p.reference[2])];
    if (p.after) {
      const [aa, ab] = [px(p.after[1]), py(p.after[2])];
      doc.lineWidth(0.8).strokeColor('#555555').moveTo(ra, rb).lineTo(aa, ab).stroke();
      doc
        .lineWidth(1.4)
        .strokeColor(p.afterHex ?? '#000000')
        .circle(aa, ab, 3.2)
        .stroke();
    }
    if (p.crossValidated) {
      const [ca, cb] = [px(p.crossValidated[1]), py(p.crossValidated[2])];
      doc.lineWidth(0.6).strokeColor('#000000');
      doc
        .moveTo(ca - 2, cb - 2)
        .lineTo(ca + 2, cb + 2)
        .stroke();
      doc
        .moveTo(ca - 2, cb + 2)
        .lineTo(ca + 2, cb - 2)
        .stroke();
    }
    doc.lineWidth(0.5).strokeColor('#000000').fillColor(p.referenceHex).circle(ra, rb, 3.6).fillAndStroke();
    label(String(p.index), ra + 4, rb - 9, 6);
  }
  doc.fillColor('#000000');
}
