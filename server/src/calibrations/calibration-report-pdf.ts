import type { Calibration, CalibrationFit, FittedCurve } from '@clearbase/contracts';
import type { Writable } from 'node:stream';
import PDFDocument from 'pdfkit';
import { abPlanePlot } from './ab-plane-plot';

/** Options of the report. */
export interface CalibrationReportOptions {
  /** Deflate the page contents. Default true; tests turn it off to read the text. */
  compress?: boolean;
}

// A4 in points (ISO 216: 210 × 297 mm at 72 pt per inch)
const PAGE = { width: 595.28, height: 841.89 };
const MARGIN = 48;
const CHANNELS = ['red', 'green', 'blue'] as const;
// plot colours of the three layers' curves (our choice: printable and told apart in grey too)
const CHANNEL_COLOURS = { red: '#c62828', green: '#2e7d32', blue: '#1565c0' } as const;

type Doc = InstanceType<typeof PDFDocument>;

/**
 * The standard PDF fonts have no Greek letters, so γ and Δ are set in the Symbol font (where 'g' and 'D' are
 * gamma and Delta) and everything else in Helvetica. One line, no wrapping.
 */
function line(doc: Doc, text: string, x: number, y: number, size = 10, bold = false): number {
  doc.fontSize(size);
  let at = x;
  for (const part of text.split(/([γΔ])/)) {
    if (!part) continue;
    const greek = part === 'γ' || part === 'Δ';
    doc.font(greek ? 'Symbol' : bold ? 'Helvetica-Bold' : 'Helvetica');
    const s = greek ? (part === 'γ' ? 'g' : 'D') : part;
    doc.text(s, at, y, { lineBreak: false });
    at += doc.widthOfString(s);
  }
  return at;
}

/** Long text, wrapped, with the Greek letters spelt out. */
function paragraph(doc: Doc, text: string, x: number, y: number, width: number, size = 9): number {
  const plain = text.replace(/γ/g, 'gamma').replace(/Δ/g, 'delta ');
  doc.font('Helvetica').fontSize(size).text(plain, x, y, { width });
  return doc.y;
}

const f = (v: number | null | undefined, digits = 2) =>
  v === null || v === undefined || !Number.isFinite(v) ? '–' : v.toFixed(digits);
const signed = (v: number, digits = 1) => `${v > 0 ? '+' : ''}${v.toFixed(digits)}`;

/** Lowest y a line of text or a drawing may reach: the bottom margin. */
const BOTTOM = PAGE.height - MARGIN;

/**
 * Where the next block goes, top-down from the top margin. A block that would run past the bottom margin starts a
 * new page instead, with its section's heading repeated ("… continued"), so nothing is drawn below the margin.
 */
class Flow {
  y = MARGIN;
  constructor(private readonly doc: Doc) {}

  /** Makes room for a block `height` points tall, starting a new page when it would not fit on this one. */
  room(height: number, continued?: () => void): void {
    if (this.y + height <= BOTTOM) return;
    this.doc.addPage();
    this.y = MARGIN;
    continued?.();
  }

  /** A single line of `size` points, `advance` points to the next. */
  line(text: string, size = 9, bold = false, advance = 14): void {
    this.room(Math.max(size, advance));
    line(this.doc, text, MARGIN, this.y, size, bold);
    this.y += advance;
  }

  /** A section heading, kept on the page of the `following` points after it. */
  heading(text: string, following = 14): void {
    this.room(18 + following);
    line(this.doc, text, MARGIN, this.y, 12, true);
    this.y += 18;
  }
}

/** Height of a wrapped paragraph as `paragraph` sets it. */
function paragraphHeight(doc: Doc, text: string, width: number, size = 9): number {
  const plain = text.replace(/γ/g, 'gamma').replace(/Δ/g, 'delta ');
  return doc.font('Helvetica').fontSize(size).heightOfString(plain, { width });
}

function summaryPage(doc: Doc, c: Calibration): void {
  const fit = c.fit;
  const flow = new Flow(doc);
  flow.line(`Calibration ${c.id}: ${c.stockName}`, 18, true, 28);
  flow.line(
    `Made ${c.createdAt.replace('T', ' ').slice(0, 16)} UTC${c.createdByName ? ` by ${c.createdByName}` : ''}; draft profile version ${c.profileVersionId ?? '–'}`,
  );
  const bracket = c.inputs.frames.filter((fr) => fr.role === 'bracket');
  flow.line(
    `${bracket.length} grey frames (${fit.usedFrames.length} used), chart frame, ${fit.base.source === 'leader' ? 'base from the leader' : 'base found on the frames'}`,
    9,
    false,
    28,
  );

  const rows: [string, (ch: (typeof CHANNELS)[number], i: number) => string][] = [
    ['γ (straight part)', (ch) => f(fit.curves[ch].gamma, 3)],
    [
      'straight part, log E',
      (ch) => `${f(fit.curves[ch].straightPart.from)} … ${f(fit.curves[ch].straightPart.to)}`,
    ],
    [
      'RMS residual, D',
      (ch, i) => f(Math.max(c.residuals.profileCurves[i]!, c.residuals.straightParts[i]!), 4),
    ],
    ['speed point, log E', (_ch, i) => f(fit.speedPoint.channels[i], 3)],
  ];
  // the table is one block: heading, column heads and its rows stay together
  flow.heading('Characteristic curves', 14 * (rows.length + 1));
  const cols = [MARGIN, MARGIN + 130, MARGIN + 230, MARGIN + 330];
  ['', 'red', 'green', 'blue'].forEach((h, i) => line(doc, h, cols[i]!, flow.y, 9, true));
  flow.y += 14;
  for (const [label, value] of rows) {
    line(doc, label, cols[0]!, flow.y, 9);
    CHANNELS.forEach((ch, i) => line(doc, value(ch, i), cols[i + 1]!, flow.y, 9));
    flow.y += 14;
  }
  flow.y += 10;
  flow.line(
    `Speed point (ISO 5800, 0.15 above base; green with the slower of red and blue): ${f(fit.speedPoint.logExposure, 3)} log E from the metered grey`,
  );
  flow.line(
    `EI ${Math.round(fit.ei)} (box ISO ${fit.iso}; ${signed(-fit.speedPoint.offsetStops, 2)} stops)`,
    11,
    true,
    24,
  );

  flow.heading('Neutral balance across the bracket', 14 * 4);
  const axes = [
    ['cyan–red', 'cyanRed'],
    ['magenta–green', 'magentaGreen'],
    ['yellow–blue', 'yellowBlue'],
  ] as const;
  for (const [name, key] of axes)
    flow.line(
      `${name}: range ${f(fit.spread.range[key], 1)} points, SD ${f(fit.spread.standardDeviation[key], 1)}, mean ${signed(fit.balance.mean[key])}`,
    );
  flow.line(`Largest spread: ${f(fit.spread.largestRange, 1)} printer points`, 9, true, 24);

  const e = fit.deltaE;
  const matrices: [string, CalibrationFit['crosstalk'] | null][] = [
    ["Density crosstalk (D' = M·D)", fit.crosstalk],
    ['Exposure matrix (film exposures to linear sRGB)', fit.exposureMatrix],
  ];
  for (const [title, m] of matrices) {
    flow.heading(title, 13 * 3);
    if (!m) flow.line('Not kept in this calibration.', 9, false, 13);
    else for (const row of m) flow.line(row.map((v) => v.toFixed(4).padStart(8)).join('   '), 9, false, 13);
    flow.y += 6;
  }
  flow.heading('Chart ΔE00 (in-gamut patches)', 14 * 3);
  flow.line(`Density only, no colour matrix: mean ${f(e.before.mean)}, max ${f(e.before.max)}`);
  flow.line(`Training (the patches the fit saw): mean ${f(e.after.mean)}, max ${f(e.after.max)}`);
  flow.line(
    `Cross-validated (each patch by a fit without it): mean ${f(e.crossValidated?.mean)}, max ${f(e.crossValidated?.max)}`,
    9,
    true,
  );
  if (e.memorisedChart)
    flow.line(
      'The cross-validated mean lies well above the training one: the colour fit memorises the chart.',
      9,
      true,
    );
  flow.line(`Neutral row with the profile: largest |Δa*| ${f(e.neutral?.a)}, |Δb*| ${f(e.neutral?.b)}`);
  for (const [k, fr] of e.frames.entries())
    flow.line(
      `Chart frame ${k + 1}: exposure ${signed(fr.exposureStops, 2)} stops${fr.labelledStops === null ? '' : ` (shot at ${signed(fr.labelledStops, 2)})`}, ${fr.patchesUsed} patches used, ΔE00 mean ${f(fr.after.mean)} max ${f(fr.after.max)}`,
    );
  flow.line(`Chart exposure from its neutral row: ${signed(fit.chartExposureStops, 2)} stops`, 9, false, 24);

  const width = PAGE.width - 2 * MARGIN;
  const texts = c.warnings.map((w) => `${w.severity === 'warning' ? 'Warning' : 'Note'}: ${w.message}`);
  flow.heading(`Warnings (${c.warnings.length})`, texts.length ? paragraphHeight(doc, texts[0]!, width) : 14);
  if (!texts.length) flow.line('None.');
  for (const text of texts) {
    flow.room(paragraphHeight(doc, text, width), () => {
      line(doc, `Warnings (${c.warnings.length}), continued`, MARGIN, flow.y, 12, true);
      flow.y += 18;
    });
    flow.y = paragraph(doc, text, MARGIN, flow.y, width) + 4;
  }
}

function curvesPage(doc: Doc, c: Calibration): void {
  const fit = c.fit;
  line(doc, 'Characteristic curves: density above base against log exposure', MARGIN, MARGIN, 14, true);
  const box = { x: MARGIN + 30, y: MARGIN + 40, w: PAGE.width - 2 * MARGIN - 40, h: 420 };
  const all = CHANNELS.flatMap((ch) => fit.curves[ch].points);
  const xs = [...all.map((p) => p.logExposure), ...fit.greyPoints.map((p) => p.logExposure)];
  const ds = [...all.map((p) => p.density), ...fit.greyPoints.flatMap((p) => p.densities)];
  const x0 = Math.floor(Math.min(...xs) * 2) / 2;
  const x1 = Math.ceil(Math.max(...xs) * 2) / 2;
  const d1 = Math.ceil(Math.max(0.5, ...ds) * 2) / 2;
  const px = (x: number) => box.x + ((x - x0) / (x1 - x0 || 1)) * box.w;
  const py = (d: number) => box.y + box.h - (Math.max(0, d) / d1) * box.h;

  doc.lineWidth(0.3).strokeColor('#bbbbbb');
  for (let x = x0; x <= x1 + 1e-9; x += 0.5) {
    doc
      .moveTo(px(x), box.y)
      .lineTo(px(x), box.y + box.h)
      .stroke();
    doc.fillColor('#444444');
    line(doc, x.toFixed(1), px(x) - 8, box.y + box.h + 4, 7);
  }
  for (let d = 0; d <= d1 + 1e-9; d += 0.25) {
    doc
      .moveTo(box.x, py(d))
      .lineTo(box.x + box.w, py(d))
      .stroke();
    doc.fillColor('#444444');
    line(doc, d.toFixed(2), box.x - 26, py(d) - 3, 7);
  }
  doc.lineWidth(0.8).strokeColor('#000000').rect(box.x, box.y, box.w, box.h).stroke();
  line(doc, 'log exposure (0 = metered grey)', box.x + box.w / 2 - 60, box.y + box.h + 16, 8);
  doc.save().rotate(-90, { origin: [box.x - 34, box.y + box.h / 2] });
  line(doc, 'density above base', box.x - 34 - 36, box.y + box.h / 2 - 4, 8);
  doc.restore();

  CHANNELS.forEach((ch, i) => {
    const colour = CHANNEL_COLOURS[ch];
    const curve: FittedCurve = fit.curves[ch];
    doc.lineWidth(1.4).strokeColor(colour);
    curve.points.forEach((p, k) =>
      k ? doc.lineTo(px(p.logExposure), py(p.density)) : doc.moveTo(px(p.logExposure), py(p.density)),
    );
    doc.stroke();
    // the fitted straight line over the straight part, drawn a little beyond it
    const { from, to, intercept } = curve.straightPart;
    const pad = 0.15 * (to - from);
    doc.lineWidth(0.9).dash(4, { space: 3 });
    doc.moveTo(px(from - pad), py(intercept + curve.gamma * (from - pad)));
    doc.lineTo(px(to + pad), py(intercept + curve.gamma * (to + pad))).stroke();
    doc.undash();
    doc.fillColor(colour);
    for (const g of fit.greyPoints) doc.circle(px(g.logExposure), py(g.densities[i]!), 1.8).fill();
    const speed = fit.speedPoint.channels[i]!;
    if (speed >= x0 && speed <= x1)
      doc
        .lineWidth(0.6)
        .moveTo(px(speed), py(0.15) - 4)
        .lineTo(px(speed), py(0.15) + 4)
        .stroke();
  });

  let y = box.y + box.h + 40;
  CHANNELS.forEach((ch, i) => {
    doc
      .fillColor(CHANNEL_COLOURS[ch])
      .rect(MARGIN, y + 2, 10, 6)
      .fill();
    doc.fillColor('#000000');
    line(
      doc,
      `${ch}: γ ${f(fit.curves[ch].gamma, 3)} over log E ${f(fit.curves[ch].straightPart.from)} … ${f(fit.curves[ch].straightPart.to)}; speed point ${f(fit.speedPoint.channels[i], 3)}${fit.curves[ch].toe ? `; toe at ${f(fit.curves[ch].toe!.logExposure)}` : ''}${fit.curves[ch].shoulder ? `; shoulder at ${f(fit.curves[ch].shoulder!.logExposure)}` : ''}`,
      MARGIN + 16,
      y,
      9,
    );
    y += 15;
  });
  line(
    doc,
    'Solid: the profile’s curve; dashed: the least-squares line over the straight part; dots: the grey frames.',
    MARGIN,
    y + 6,
    8,
  );
}

function deltaEPage(doc: Doc, c: Calibration): void {
  const cols = {
    n: MARGIN,
    name: MARGIN + 24,
    ref: MARGIN + 130,
    res: MARGIN + 180,
    before: MARGIN + 230,
    after: MARGIN + 290,
    cv: MARGIN + 345,
    note: MARGIN + 410,
  };
  const flow = new Flow(doc);
  const head = (title: string) => {
    line(doc, title, MARGIN, flow.y, 14, true);
    flow.y += 30;
    line(doc, '#', cols.n, flow.y, 8, true);
    line(doc, 'patch', cols.name, flow.y, 8, true);
    line(doc, 'reference', cols.ref - 4, flow.y, 8, true);
    line(doc, 'result', cols.res + 4, flow.y, 8, true);
    line(doc, 'ΔE00 before', cols.before, flow.y, 8, true);
    line(doc, 'ΔE00 after', cols.after, flow.y, 8, true);
    line(doc, 'ΔE00 cross-val.', cols.cv, flow.y, 8, true);
    flow.y += 14;
  };
  head('Chart patches: ΔE00 in reference rendering');
  const row = 25;
  for (const p of c.fit.deltaE.patches) {
    flow.room(row, () => head('Chart patches: ΔE00 in reference rendering, continued'));
    const y = flow.y;
    doc.fillColor('#000000');
    line(doc, String(p.index), cols.n, y + 7, 9);
    line(doc, p.name, cols.name, y + 7, 9);
    doc
      .fillColor(p.referenceHex)
      .rect(cols.ref, y, 44, row - 4)
      .fill();
    if (p.afterHex)
      doc
        .fillColor(p.afterHex)
        .rect(cols.ref + 44, y, 44, row - 4)
        .fill();
    doc.fillColor('#000000');
    line(doc, f(p.deltaEBefore), cols.before + 10, y + 7, 9);
    line(doc, f(p.deltaEAfter), cols.after + 10, y + 7, 9);
    line(doc, f(p.deltaECrossValidated), cols.cv + 10, y + 7, 9);
    line(
      doc,
      !p.measured ? 'not measured' : p.inGamut ? '' : 'outside sRGB, not in means',
      cols.note,
      y + 7,
      7,
    );
    flow.y += row;
  }
  flow.y += 8;
  flow.line(
    `Mean over in-gamut patches: before ${f(c.fit.deltaE.before.mean)}, after ${f(c.fit.deltaE.after.mean)}, cross-validated ${f(c.fit.deltaE.crossValidated?.mean)}; max after ${f(c.fit.deltaE.after.max)}`,
    9,
    true,
  );
  flow.line(
    'Before: the measured curves alone, no colour matrix. After: the profile (training).',
    8,
    false,
    12,
  );
}

function abPlanePage(doc: Doc, c: Calibration): void {
  line(doc, 'Chart patches in the a*b* plane: published colour against the result', MARGIN, MARGIN, 14, true);
  const size = PAGE.width - 2 * MARGIN - 40;
  abPlanePlot(doc, c.fit.deltaE.patches, { x: MARGIN + 30, y: MARGIN + 50, size });
  const y = MARGIN + 50 + size + 36;
  paragraph(
    doc,
    'Filled dot: the published colour of the patch (its number beside it); ring: the profile’s result; the line joins them, so a long line is a colour that is off and its direction the cast. A cross: the patch as predicted by a fit that never saw it (cross-validated). Lightness is left out: see the table for the whole ΔE00.',
    MARGIN,
    y,
    PAGE.width - 2 * MARGIN,
    8,
  );
}

/**
 * Writes a calibration's report as an A4 PDF to `out` (an HTTP response or a file stream): first the fitted values
 * (γ, speed point and EI, neutral spread, the crosstalk and exposure matrices, training and cross-validated ΔE00,
 * warnings), then a page of the three characteristic curves with their fitted lines as vector plots, then the
 * per-patch ΔE00 table (before, after, cross-validated) with reference and result swatches side by side, then the
 * patches in the a*b* plane, reference joined to result: four pages, more when a long list of warnings or the table runs on (each continued page says so). Nothing
 * is drawn below the bottom margin. Resolves when the document has been written out.
 *
 * @example
 * res.type('application/pdf');
 * await writeCalibrationReport(calibration, res);
 */
export function writeCalibrationReport(
  calibration: Calibration,
  out: Writable,
  options: CalibrationReportOptions = {},
): Promise<void> {
  const doc = new PDFDocument({
    size: 'A4',
    margin: MARGIN,
    compress: options.compress ?? true,
    autoFirstPage: true,
    info: { Title: `Calibration ${calibration.id}: ${calibration.stockName}`, Creator: 'Clearbase' },
  });
  const done = new Promise<void>((resolve, reject) => {
    out.on('finish', () => resolve());
    out.on('error', reject);
    doc.on('error', reject);
  });
  doc.pipe(out);
  summaryPage(doc, calibration);
  doc.addPage();
  curvesPage(doc, calibration);
  doc.addPage();
  deltaEPage(doc, calibration);
  doc.addPage();
  abPlanePage(doc, calibration);
  doc.end();
  return done;
}
