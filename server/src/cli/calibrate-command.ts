import { mkdir, rename, unlink, writeFile } from 'node:fs/promises';
import { dirname } from 'node:path';
import sharp from 'sharp';
import { validateScannerProfile, type ScannerProfile } from '@clearbase/contracts';
import {
  baseFromRegion,
  chartGridFromCorners,
  chartGridFromRegion,
  CHART_REFERENCE,
  detectFilmBase,
  fitCalibration,
  LINEAR_SCANNER,
  rollBase,
  sampleRegion,
  type CalibrationResult,
  type CharacteristicCurveFit,
  type ChartGrid,
  type FilmBase,
  type Point,
  type Region,
  type RegionSample,
  type RgbImage,
} from '@clearbase/inversion';
import { ImageInputError, readNegative } from '../imaging/index';
import { parseCommandArgs } from './parse-command-args';
import { readDocument } from './profile-document';
import { UsageError } from './usage-error';

const FILM_BASES = ['clear', 'tinted', 'masked'] as const;

/**
 * `clearbase calibrate --bracket FILE:STOPS[:x,y,w,h] … --chart FILE [--more-chart FILE[:STOPS] …] --chart-region
 * x,y,w,h | --chart-corners x1,y1,…,x4,y4 --out PROFILE.json …`: see the usage text. Fits a stock profile from a
 * calibration roll and writes it as a profile document; `--more-chart` adds frames of the same chart at other
 * exposures (marked by the same region or corners) to the colour fit. Resolves to 0 when the fit raised no
 * warning, 1 when it was written with warnings (among them a colour fit that memorises the chart) or could not be
 * made (unreadable file, no usable base, too few usable frames).
 * Frames are read one at a time and only their samples kept, so full-size scans fit in memory.
 */
export async function calibrateCommand(args: string[]): Promise<number> {
  const { values, positionals } = parseCommandArgs(args, {
    bracket: { type: 'string', multiple: true },
    chart: { type: 'string' },
    'more-chart': { type: 'string', multiple: true },
    'chart-region': { type: 'string' },
    'chart-corners': { type: 'string' },
    'grey-region': { type: 'string' },
    'base-region': { type: 'string' },
    leader: { type: 'string' },
    scanner: { type: 'string' },
    stock: { type: 'string', default: 'Calibrated stock' },
    iso: { type: 'string', default: '100' },
    'film-base': { type: 'string', default: 'clear' },
    out: { type: 'string' },
    json: { type: 'boolean', default: false },
  });
  if (positionals.length) throw new UsageError(`Unexpected argument "${positionals[0]}".`);
  const brackets = (values.bracket ?? []).map(parseBracket);
  if (!brackets.length) throw new UsageError('No grey frames given: add --bracket FILE:STOPS for each.');
  if (!values.chart) throw new UsageError('Missing --chart FILE.');
  if (!values.out) throw new UsageError('Missing --out PROFILE.json.');
  if (!values['chart-region'] === !values['chart-corners'])
    throw new UsageError('Give exactly one of --chart-region x,y,w,h and --chart-corners x1,y1,…,x4,y4.');
  const chartRegion = values['chart-region'] ? parseRegion('chart-region', values['chart-region']) : null;
  const chartCorners = values['chart-corners'] ? parseCorners(values['chart-corners']) : null;
  const greyRegion = values['grey-region'] ? parseRegion('grey-region', values['grey-region']) : null;
  const baseRegion = values['base-region'] ? parseRegion('base-region', values['base-region']) : null;
  const iso = Number(values.iso);
  if (!(Number.isFinite(iso) && iso > 0))
    throw new UsageError(`Expected number above 0 for --iso but received ${values.iso}.`);
  const filmBase = values['film-base'] as (typeof FILM_BASES)[number];
  if (!FILM_BASES.includes(filmBase))
    throw new UsageError(
      `Expected one of ${FILM_BASES.join(', ')} for --film-base but received ${values['film-base']}.`,
    );
  let scanner: ScannerProfile = LINEAR_SCANNER;
  if (values.scanner) {
    const read = await readDocument(values.scanner, validateScannerProfile);
    if (!read.ok) throw new UsageError(`Invalid document:\n  ${read.errors.join('\n  ')}`);
    scanner = read.value;
  }

  sharp.cache(false);
  const fail = (message: string) => {
    process.stderr.write(`clearbase: ${message}\n`);
    return 1;
  };
  const read = async (file: string): Promise<RgbImage | string> => {
    try {
      return await readNegative(file);
    } catch (error) {
      if (error instanceof ImageInputError) return `${file}: ${error.message}`;
      throw error;
    }
  };

  // Each frame is read, sampled and let go.
  const bases: FilmBase[] = [];
  const measure = (image: RgbImage) =>
    bases.push(baseRegion ? baseFromRegion(image, scanner, baseRegion) : detectFilmBase(image, scanner));
  const samples: { stops: number; sample: RegionSample }[] = [];
  for (const b of brackets) {
    const image = await read(b.file);
    if (typeof image === 'string') return fail(image);
    const region = b.greyRegion ?? greyRegion ?? centralHalf(image);
    const [x, y, w, h] = region;
    if (x + w > image.width || y + h > image.height)
      throw new UsageError(
        `The grey rectangle ${region.join(',')} of ${b.file} runs past the frame's ${image.width} × ${image.height} pixels${b.greyRegion ? '' : ' (from --grey-region)'}.`,
      );
    samples.push({ stops: b.stops, sample: sampleRegion(image, scanner, region) });
    if (!values.leader) measure(image);
  }
  const chartImage = await read(values.chart);
  if (typeof chartImage === 'string') return fail(chartImage);
  let grid: ChartGrid;
  try {
    grid = chartCorners ? chartGridFromCorners(chartCorners) : chartGridFromRegion(chartRegion!);
  } catch (error) {
    throw new UsageError(`--chart-corners: ${(error as Error).message}.`);
  }
  const chart = grid.patches.map((p) => sampleRegion(chartImage, scanner, p.sample));
  // More frames of the same chart at other exposures, marked as the first one is.
  const moreCharts: { samples: RegionSample[]; stops?: number }[] = [];
  for (const more of (values['more-chart'] ?? []).map(parseMoreChart)) {
    const image = await read(more.file);
    if (typeof image === 'string') return fail(image);
    moreCharts.push({
      samples: grid.patches.map((p) => sampleRegion(image, scanner, p.sample)),
      ...(more.stops === undefined ? {} : { stops: more.stops }),
    });
  }
  if (values.leader) {
    const leader = await read(values.leader);
    if (typeof leader === 'string') return fail(leader);
    bases.push(baseFromRegion(leader, scanner, baseRegion ?? [0, 0, leader.width, leader.height]));
  } else measure(chartImage);
  const base = rollBase(bases);
  if (!(base.confidence > 0))
    return fail(
      'No usable film base was found; give --leader FILE (unexposed film) or --base-region x,y,w,h on a rebate.',
    );

  let result: CalibrationResult;
  try {
    result = fitCalibration({
      base: base.rgb,
      brackets: samples,
      chart,
      moreCharts,
      stock: { name: values.stock, iso, base: filmBase },
      reference: CHART_REFERENCE,
    });
  } catch (error) {
    if (error instanceof RangeError) return fail(`the calibration cannot be fitted: ${error.message}.`);
    throw error;
  }
  await writeAtomically(values.out, `${JSON.stringify(result.profileDocument, null, 2)}\n`);
  const problems = result.warnings.filter((w) => w.severity === 'warning');
  if (values.json)
    process.stdout.write(`${JSON.stringify(calibrationReport(result, grid, base, values.out))}\n`);
  else process.stdout.write(describeCalibration(result, values.out));
  for (const w of problems) process.stderr.write(`clearbase: warning: ${w.message}\n`);
  return problems.length ? 1 : 0;
}

/** The calibration as plain JSON: fitted values, residuals, warnings and the chart grid's polygons. */
export function calibrationReport(result: CalibrationResult, grid: ChartGrid, base: FilmBase, out: string) {
  const curve = (f: CharacteristicCurveFit) => {
    const { curve: _curve, ...rest } = f;
    return rest;
  };
  const channels = (c: CalibrationResult['curves']) => ({
    red: curve(c.red),
    green: curve(c.green),
    blue: curve(c.blue),
  });
  return {
    profile: out,
    base: { rgb: base.rgb, region: base.region, confidence: base.confidence },
    gamma: result.gamma,
    curves: channels(result.curves),
    measuredCurves: channels(result.measuredCurves),
    speedPoint: result.speedPoint,
    ei: result.ei,
    balance: result.balance,
    spread: result.spread,
    crosstalk: result.crosstalk,
    exposureMatrix: result.exposureMatrix,
    chartExposureStops: result.chartExposureStops,
    deltaE: result.deltaE,
    usedFrames: result.usedFrames,
    warnings: result.warnings,
    grid: grid.patches.map((p) => ({ index: p.index, cell: p.cell, sample: p.sample })),
  };
}

function describeCalibration(r: CalibrationResult, out: string): string {
  const f = (v: number, d = 3) => v.toFixed(d);
  const matrix = (m: readonly (readonly number[])[]) =>
    m.map((row) => `[${row.map((v) => f(v)).join(', ')}]`).join(' ');
  const e = r.deltaE;
  const stops = (v: number) => `${v >= 0 ? '+' : ''}${f(v, 2)}`;
  const lines = [
    `profile written to ${out}`,
    `γ (red, green, blue): ${r.gamma.map((g) => f(g)).join(', ')}`,
    `speed point: ${f(r.speedPoint.logExposure)} log E from the metered grey, ${f(r.speedPoint.offsetStops, 2)} stops from box speed: EI ${Math.round(r.ei)}`,
    `crosstalk (density): ${matrix(r.crosstalk.matrix)}`,
    `exposure matrix (film exposures → linear sRGB): ${matrix(r.exposureMatrix)}`,
    `chart ΔE00 (in gamut): before mean ${f(e.before.mean, 2)} max ${f(e.before.max, 2)}; fitted mean ${f(e.after.mean, 2)} max ${f(e.after.max, 2)}; cross-validated (each patch by a fit without it) mean ${f(e.crossValidated.mean, 2)} max ${f(e.crossValidated.max, 2)}`,
    `neutral row after the profile: largest |Δa*| ${f(e.neutral.a, 2)}, |Δb*| ${f(e.neutral.b, 2)}`,
    ...e.frames.map(
      (frame, k) =>
        `chart frame ${k + 1}: exposure ${stops(frame.exposureStops)} stops${frame.labelledStops === undefined ? '' : ` (labelled ${stops(frame.labelledStops)})`}, ${frame.patchesUsed} patches fitted, ΔE00 mean ${f(frame.after.mean, 2)} max ${f(frame.after.max, 2)}`,
    ),
    `neutral spread over the bracket: ${f(r.spread.largestRange, 1)} points (cyan–red ${f(r.spread.range.cyanRed, 1)}, magenta–green ${f(r.spread.range.magentaGreen, 1)}, yellow–blue ${f(r.spread.range.yellowBlue, 1)})`,
    ...r.warnings.filter((w) => w.severity === 'notice').map((w) => `note: ${w.message}`),
  ];
  return `${lines.join('\n')}\n`;
}

/** One --more-chart: the file and, when given, the stops it was shot at. */
function parseMoreChart(raw: string): { file: string; stops?: number } {
  const at = raw.lastIndexOf(':');
  const stops = at > 0 ? parseStops(raw.slice(at + 1)) : Number.NaN;
  if (Number.isFinite(stops)) return { file: raw.slice(0, at), stops };
  if (!raw) throw new UsageError('Expected FILE or FILE:STOPS for --more-chart but received nothing.');
  return { file: raw };
}

/** One --bracket: the file, its stops and, when given, its own grey rectangle. */
interface BracketArg {
  file: string;
  stops: number;
  greyRegion: Region | null;
}

/**
 * FILE:STOPS or FILE:STOPS:x,y,w,h. The file name may hold colons itself: the stops are the last field, or the one
 * before a last field that is not stops (then that field is the rectangle, and must be one).
 */
function parseBracket(raw: string): BracketArg {
  const at = raw.lastIndexOf(':');
  const last = at > 0 ? raw.slice(at + 1) : '';
  if (at > 0 && !Number.isFinite(parseStops(last))) {
    const rest = raw.slice(0, at);
    const before = rest.lastIndexOf(':');
    const stops = before > 0 ? parseStops(rest.slice(before + 1)) : Number.NaN;
    if (Number.isFinite(stops)) {
      const greyRegion = parseRectangle(last);
      if (!greyRegion)
        throw new UsageError(
          `Expected x,y,w,h in pixels (whole numbers, width and height above 0) for the grey rectangle of --bracket ${raw} but received ${last}.`,
        );
      return { file: rest.slice(0, before), stops, greyRegion };
    }
  }
  const stops = at > 0 ? parseStops(last) : Number.NaN;
  if (!Number.isFinite(stops))
    throw new UsageError(
      `Expected FILE:STOPS or FILE:STOPS:x,y,w,h (e.g. grey-03.tif:-1, grey-04.tif:-2/3 or grey-05.tif:0:40,30,64,48) for --bracket but received ${raw}.`,
    );
  return { file: raw.slice(0, at), stops, greyRegion: null };
}

/** Stops as a decimal (+1, -0.33) or a fraction (-2/3). */
function parseStops(raw: string): number {
  const m = /^([+-]?\d+)\/(\d+)$/.exec(raw.trim());
  if (m) return Number(m[2]) === 0 ? Number.NaN : Number(m[1]) / Number(m[2]);
  return raw.trim() === '' ? Number.NaN : Number(raw);
}

/** x,y,w,h in whole pixels with a width and height, or null. */
function parseRectangle(raw: string): Region | null {
  const parts = raw.split(',').map((v) => (v.trim() === '' ? Number.NaN : Number(v)));
  if (parts.length !== 4 || !parts.every((v) => Number.isInteger(v) && v >= 0) || !parts[2] || !parts[3])
    return null;
  return parts as Region;
}

function parseRegion(name: string, raw: string): Region {
  const region = parseRectangle(raw);
  if (!region) throw new UsageError(`Expected x,y,w,h in pixels for --${name} but received ${raw}.`);
  return region;
}

function parseCorners(raw: string): Point[] {
  const parts = raw.split(',').map(Number);
  if (parts.length !== 8 || !parts.every(Number.isFinite))
    throw new UsageError(
      `Expected x1,y1,x2,y2,x3,y3,x4,y4 in pixels for --chart-corners but received ${raw}.`,
    );
  return [0, 2, 4, 6].map((i) => [parts[i]!, parts[i + 1]!] as Point);
}

/** The central half of a frame each way: the default grey rectangle. */
function centralHalf(image: RgbImage): Region {
  return [
    Math.floor(image.width / 4),
    Math.floor(image.height / 4),
    Math.max(1, Math.floor(image.width / 2)),
    Math.max(1, Math.floor(image.height / 2)),
  ];
}

async function writeAtomically(path: string, text: string): Promise<void> {
  await mkdir(dirname(path), { recursive: true });
  const tmp = `${path}.${process.pid}.tmp`;
  try {
    await writeFile(tmp, text);
    await rename(tmp, path);
  } catch (error) {
    await unlink(tmp).catch(() => undefined);
    throw error;
  }
}
