import type { Calibration, FittedCurve } from '@clearbase/contracts';
import type { Writable } from 'node:stream';
import PDFDocument from 'pdfkit';

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

function summaryPage(doc: Doc, c: Calibration): void {
  const fit = c.fit;
  let y = MARGIN;
  line(doc, `Calibration ${c.id}: ${c.stockName}`, MARGIN, y, 18, true);
  y += 28;
  line(
    doc,
    `Made ${c.createdAt.replace('T', ' ').slice(0, 16)} UTC${c.createdByName ? ` by ${c.createdByName}` : ''}; draft profile version ${c.profileVersionId ?? '–'}`,
    MARGIN,
    y,
    9,
  );
  y += 14;
  const bracket = c.inputs.frames.filter((fr) => fr.role === 'bracket');
  line(
    doc,
    `${bracket.length} grey frames (${fit.usedFrames.length} used), chart frame, ${fit.base.source === 'leader' ? 'base from the leader' : 'base found on the frames'}`,
    MARGIN,
    y,
    9,
  );
  y += 28;

  line(doc, 'Characteristic curves', MARGIN, y, 12, true);
  y += 18;
  const cols = [MARGIN, MARGIN + 130, MARGIN + 230, MARGIN + 330];
  ['', 'red', 'green', 'blue'].forEach((h, i) => line(doc, h, cols[i]!, y, 9, true));
  y += 14;
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
  for (const [label, value] of rows) {
    line(doc, label, cols[0]!, y, 9);
    CHANNELS.forEach((ch, i) => line(doc, value(ch, i), cols[i + 1]!, y, 9));
    y += 14;
  }
  y += 10;
  line(
    doc,
    `Speed point (ISO 5800, 0.15 above base; green with the slower of red and blue): ${f(fit.speedPoint.logExposure, 3)} log E from the metered grey`,
    MARGIN,
    y,
    9,
  );
  y += 14;
  line(
    doc,
    `EI ${Math.round(fit.ei)} (box ISO ${fit.iso}; ${signed(-fit.speedPoint.offsetStops, 2)} stops)`,
    MARGIN,
    y,
    11,
    true,
  );
  y += 24;

  line(doc, 'Neutral balance across the bracket', MARGIN, y, 12, true);
  y += 18;
  const axes = [
    ['cyan–red', 'cyanRed'],
    ['magenta–green', 'magentaGreen'],
    ['yellow–blue', 'yellowBlue'],
  ] as const;
  for (const [name, key] of axes) {
    line(
      doc,
      `${name}: range ${f(fit.spread.range[key], 1)} points, SD ${f(fit.spread.standardDeviation[key], 1)}, mean ${signed(fit.balance.mean[key])}`,
      MARGIN,
      y,
      9,
    );
    y += 14;
  }
  line(doc, `Largest spread: ${f(fit.spread.largestRange, 1)} printer points`, MARGIN, y, 9, true);
  y += 24;

  line(doc, 'Crosstalk matrix and chart', MARGIN, y, 12, true);
  y += 18;
  for (const row of fit.crosstalk) {
    line(doc, row.map((v) => v.toFixed(4).padStart(8)).join('   '), MARGIN, y, 9);
    y += 13;
  }
  y += 6;
  line(
    doc,
    `Chart ΔE00 (in gamut): before the matrix mean ${f(fit.deltaE.before.mean)} max ${f(fit.deltaE.before.max)}; after mean ${f(fit.deltaE.after.mean)} max ${f(fit.deltaE.after.max)}`,
    MARGIN,
    y,
    9,
  );
  y += 14;
  line(doc, `Chart exposure from its neutral row: ${signed(fit.chartExposureStops, 2)} stops`, MARGIN, y, 9);
  y += 24;

  line(doc, `Warnings (${c.warnings.length})`, MARGIN, y, 12, true);
  y += 18;
  if (!c.warnings.length) line(doc, 'None.', MARGIN, y, 9);
  for (const w of c.warnings) {
    if (y > PAGE.height - MARGIN - 30) break;
    y =
      paragraph(
        doc,
        `${w.severity === 'warning' ? 'Warning' : 'Note'}: ${w.message}`,
        MARGIN,
        y,
        PAGE.width - 2 * MARGIN,
      ) + 4;
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
  line(doc, 'Chart patches: ΔE00 in reference rendering', MARGIN, MARGIN, 14, true);
  const cols = {
    n: MARGIN,
    name: MARGIN + 24,
    ref: MARGIN + 150,
    res: MARGIN + 200,
    before: MARGIN + 270,
    after: MARGIN + 350,
    note: MARGIN + 420,
  };
  let y = MARGIN + 30;
  line(doc, '#', cols.n, y, 8, true);
  line(doc, 'patch', cols.name, y, 8, true);
  line(doc, 'reference', cols.ref - 4, y, 8, true);
  line(doc, 'result', cols.res + 4, y, 8, true);
  line(doc, 'ΔE00 before', cols.before, y, 8, true);
  line(doc, 'ΔE00 after', cols.after, y, 8, true);
  y += 14;
  const row = 25;
  for (const p of c.fit.deltaE.patches) {
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
    line(
      doc,
      !p.measured ? 'not measured' : p.inGamut ? '' : 'outside sRGB, not in means',
      cols.note,
      y + 7,
      7,
    );
    y += row;
  }
  y += 8;
  line(
    doc,
    `Mean over in-gamut patches: before ${f(c.fit.deltaE.before.mean)}, after ${f(c.fit.deltaE.after.mean)}; max after ${f(c.fit.deltaE.after.max)}`,
    MARGIN,
    y,
    9,
    true,
  );
}

/**
 * Writes a calibration's report as a three-page A4 PDF to `out` (an HTTP response or a file stream): page 1 the
 * fitted values (γ, speed point and EI, neutral spread, crosstalk, warnings), page 2 the three characteristic curves
 * with their fitted lines as vector plots, page 3 the per-patch ΔE00 table with reference and result swatches side
 * by side. Resolves when the document has been written out.
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
  doc.end();
  return done;
}
