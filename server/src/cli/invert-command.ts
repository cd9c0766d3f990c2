import { mkdir } from 'node:fs/promises';
import { freemem } from 'node:os';
import { basename, extname, join } from 'node:path';
import sharp from 'sharp';
import {
  validateProfileDocument,
  validateScannerProfile,
  type ProfileDocument,
  type ScannerProfile,
} from '@clearbase/contracts';
import {
  LINEAR_SCANNER,
  rollBase,
  rollLevels,
  type FilmBase,
  type Region,
  type RgbImage,
} from '@clearbase/inversion';
import {
  ImageInputError,
  POSITIVE_EXTENSIONS,
  type NegativeImage,
  type PositiveFormat,
} from '../imaging/index';
import { createInversionPool, type InversionPool } from '../inversion-pool/inversion-pool';
import { measureWhileReading } from '../inversion-pool/measure-while-reading';
import { mayKeepFrame } from '../inversion-pool/roll-keep-budget';
import { runPipelined } from '../inversion-pool/run-pipelined';
import { FilmBaseError } from '../film-base/film-base-error';
import { measureFilmBase } from '../film-base/measure-film-base';
import {
  invertNegativeFile,
  measureLevels,
  NEUTRAL_PROFILE,
  readPooledNegative,
  type FrameResult,
  type FrameSettings,
} from '../inversion-pool/invert-negative-file';
import { parseCommandArgs } from './parse-command-args';
import { readDocument, type DocumentValidator } from './profile-document';
import { integerOption } from './synth-command';
import { UsageError } from './usage-error';

const FORMATS: PositiveFormat[] = ['jpeg', 'tiff16', 'png16'];
// Frames in flight at once: one decoding or encoding while another is on the pool.
const FRAMES_IN_FLIGHT = 2;

/**
 * `clearbase invert <negative...> --out DIR ...`: see the usage text. Resolves to 0 when every
 * frame was written, 1 when some failed (the others are written).
 */
export async function invertCommand(args: string[]): Promise<number> {
  const { values, positionals: files } = parseCommandArgs(args, {
    out: { type: 'string' },
    profile: { type: 'string' },
    scanner: { type: 'string' },
    base: { type: 'string', default: 'auto' },
    roll: { type: 'boolean', default: false },
    exposure: { type: 'string', default: 'auto' },
    'exposure-stops': { type: 'string', default: '0' },
    format: { type: 'string', default: 'jpeg' },
    render: { type: 'string', default: 'print' },
    quality: { type: 'string' },
    threads: { type: 'string' },
    json: { type: 'boolean', default: false },
  });
  if (files.length === 0) throw new UsageError('No negatives given.');
  if (!values.out) throw new UsageError('Missing --out DIR.');
  const format = values.format as PositiveFormat;
  if (!FORMATS.includes(format))
    throw new UsageError(`Expected one of ${FORMATS.join(', ')} for --format but received ${values.format}.`);
  if (values.render !== 'print' && values.render !== 'reference') {
    throw new UsageError(`Expected print or reference for --render but received ${values.render}.`);
  }
  const base = parseBase(values.base);
  if (values.exposure !== 'auto' && values.exposure !== 'metered') {
    throw new UsageError(`Expected auto or metered for --exposure but received ${values.exposure}.`);
  }
  const exposure = { mode: values.exposure, stops: parseStops(values['exposure-stops']) } as const;
  const threads = values.threads === undefined ? undefined : integerOption('threads', values.threads, 1, 256);
  const quality = values.quality === undefined ? undefined : integerOption('quality', values.quality, 1, 100);
  const profile: ProfileDocument = values.profile
    ? await loadDocument(values.profile, validateProfileDocument)
    : NEUTRAL_PROFILE;
  const scanner: ScannerProfile = values.scanner
    ? await loadDocument(values.scanner, validateScannerProfile)
    : LINEAR_SCANNER;

  await mkdir(values.out, { recursive: true });
  // Each file is decoded once (twice for a roll too large to keep in memory); libvips' operation cache would only hold memory.
  sharp.cache(false);
  const settings: FrameSettings = {
    profile,
    scanner,
    base,
    render: values.render,
    exposure,
    format,
    ...(quality ? { quality } : {}),
  };
  const outputs = outputNames(files, values.out, format);
  const report = reporter(files.length, values.json);
  let failed = 0;
  const todo = [...files.keys()];

  // Started first, so the workers come up while the first negative decodes.
  const pool = createInversionPool(threads ? { threads } : {});
  try {
    const kept = values.roll
      ? await measureRoll(pool, files, todo, settings, report)
      : new Map<number, NegativeImage>();
    failed += files.length - todo.length;
    await runPipelined(todo, FRAMES_IN_FLIGHT, async (index) => {
      const decoded = kept.get(index);
      kept.delete(index);
      try {
        report.success(await invertNegativeFile(pool, files[index]!, outputs[index]!, settings, decoded));
      } catch (error) {
        if (!(error instanceof ImageInputError || error instanceof FilmBaseError)) throw error;
        failed++;
        report.failure(files[index]!, error);
      }
    });
  } finally {
    await pool.close();
  }
  return failed ? 1 : 0;
}

/**
 * The measuring pass of a roll: decodes each frame once, measures its base and keeps a small strided sample
 * for levels; the roll base is the frames' robust median and the roll-wide levels are measured on the samples
 * against it (`settings` gets both). Frames that fail are reported and taken out of `todo`. Decoded frames are
 * kept for the inverting pass while they fit in a quarter of the free memory (`mayKeepFrame`, at least 256 MB);
 * the others are decoded again there.
 */
async function measureRoll(
  pool: InversionPool,
  files: string[],
  todo: number[],
  settings: FrameSettings,
  report: ReturnType<typeof reporter>,
): Promise<Map<number, NegativeImage>> {
  // By frame index, so the roll's figures do not depend on which decode finished first.
  const bases: FilmBase[] = [];
  const samples: RgbImage[] = [];
  const kept = new Map<number, NegativeImage>();
  let keptBytes = 0;
  const failures: number[] = [];
  // Two frames decode at once, as in the inverting pass: a decode keeps about one core busy.
  await runPipelined([...todo], FRAMES_IN_FLIGHT, async (index) => {
    try {
      // Measured as it is copied in, while its rows are in cache (the same base and sample as afterwards).
      const reading = measureWhileReading(settings.scanner, {
        detectBase: settings.base === 'auto',
        sampleLevels: true,
      });
      const negative = await readPooledNegative(pool, files[index]!, settings, reading.onRows);
      let keep = false;
      try {
        bases[index] = measureFilmBase(negative, settings, reading).base;
        samples[index] = reading.levelSample();
        keep = mayKeepFrame(negative.data.byteLength, keptBytes, freemem());
        if (keep) {
          kept.set(index, negative);
          keptBytes += negative.data.byteLength;
        }
      } finally {
        if (!keep) pool.buffers.release(negative.data);
      }
    } catch (error) {
      if (!(error instanceof ImageInputError || error instanceof FilmBaseError)) throw error;
      failures.push(index);
      report.failure(files[index]!, error);
    }
  });
  for (const index of failures) todo.splice(todo.indexOf(index), 1);
  if (todo.length) {
    const roll = rollBase(todo.map((index) => bases[index]!));
    settings.base = roll;
    if (settings.exposure?.mode !== 'metered')
      settings.levels = rollLevels(
        todo.map((index) => measureLevels(samples[index]!, settings, roll, { step: 1 })),
      ).roll;
  }
  return kept;
}

// Exposure steps of the command line: as the roll and frame controls (1/6 stop, up to 6 stops either way).
const STOPS_PER_STEP = 6,
  MAX_EXPOSURE_STOPS = 6;

/** `--exposure-stops N`: a multiple of 1/6 stop within ±6, written as a decimal (0.5) or a fraction (-2/3). */
function parseStops(raw: string): number {
  const match = /^([+-]?)(\d+(?:\.\d+)?)(?:\/(\d+))?$/.exec(raw.trim());
  const value = match
    ? (match[1] === '-' ? -1 : 1) * (Number(match[2]) / (match[3] ? Number(match[3]) : 1))
    : Number.NaN;
  const steps = value * STOPS_PER_STEP;
  if (
    !Number.isFinite(value) ||
    Math.abs(steps - Math.round(steps)) > 1e-6 ||
    Math.abs(value) > MAX_EXPOSURE_STOPS
  ) {
    throw new UsageError(
      `Expected a multiple of 1/6 stop between -${MAX_EXPOSURE_STOPS} and ${MAX_EXPOSURE_STOPS} for --exposure-stops but received ${raw}.`,
    );
  }
  return Math.round(steps) / STOPS_PER_STEP;
}

function parseBase(raw: string): 'auto' | Region {
  if (raw === 'auto') return 'auto';
  const parts = raw.split(',').map(Number);
  if (
    parts.length !== 4 ||
    !parts.every((v) => Number.isInteger(v) && v >= 0) ||
    parts[2] === 0 ||
    parts[3] === 0
  ) {
    throw new UsageError(`Expected auto or x,y,w,h in pixels for --base but received ${raw}.`);
  }
  return parts as Region;
}

async function loadDocument<T>(path: string, validate: DocumentValidator<T>): Promise<T> {
  const result = await readDocument(path, validate);
  if (!result.ok) throw new UsageError(`Invalid document:\n  ${result.errors.join('\n  ')}`);
  return result.value;
}

/** out/<name>.<ext>, with -2, -3 ... when two negatives share a name. */
function outputNames(files: string[], out: string, format: PositiveFormat): string[] {
  const seen = new Map<string, number>();
  return files.map((file) => {
    const stem = basename(file, extname(file));
    const n = (seen.get(stem) ?? 0) + 1;
    seen.set(stem, n);
    return join(out, `${n > 1 ? `${stem}-${n}` : stem}${POSITIVE_EXTENSIONS[format]}`);
  });
}

function reporter(total: number, json: boolean) {
  let done = 0;
  const progress = (file: string, status: string) => {
    done++;
    if (process.stderr.isTTY) process.stderr.write(`[${done}/${total}] ${basename(file)} ${status}\n`);
  };
  return {
    success(r: FrameResult) {
      progress(r.file, `${r.ms} ms`);
      const line = {
        file: r.file,
        output: r.output,
        base: {
          rgb: r.base.rgb.map((v) => Number(v.toFixed(6))),
          region: r.base.region,
          confidence: r.base.confidence,
        },
        warnings: r.warnings,
        exposure: {
          midLogExposure: Number(r.exposure.midLogExposure.toFixed(6)),
          source: r.exposure.source,
          stops: Number(r.exposure.stops.toFixed(6)),
        },
        ms: r.ms,
      };
      if (json) process.stdout.write(`${JSON.stringify(line)}\n`);
      else
        process.stdout.write(
          `${r.file} -> ${r.output} (${r.ms} ms)${r.warnings.map((w) => `\n  warning: ${w}`).join('')}\n`,
        );
    },
    failure(file: string, error: unknown) {
      progress(file, 'failed');
      const code = error instanceof ImageInputError || error instanceof FilmBaseError ? error.code : 'failed';
      const message = error instanceof Error ? error.message : String(error);
      if (json) process.stdout.write(`${JSON.stringify({ file, error: { code, message } })}\n`);
      process.stderr.write(`clearbase: ${file}: ${message}\n`);
    },
  };
}
