import { mkdir } from 'node:fs/promises';
import { basename, extname, join } from 'node:path';
import sharp from 'sharp';
import {
  validateProfileDocument,
  validateScannerProfile,
  type ProfileDocument,
  type ScannerProfile,
} from '@clearbase/contracts';
import { LINEAR_SCANNER, rollBase, rollLevels, type FrameLevels, type Region } from '@clearbase/inversion';
import { ImageInputError, POSITIVE_EXTENSIONS, readNegative, type PositiveFormat } from '../imaging/index';
import { createInversionPool } from '../inversion-pool/inversion-pool';
import { runPipelined } from '../inversion-pool/run-pipelined';
import {
  FilmBaseError,
  invertNegativeFile,
  measureBase,
  measureLevels,
  NEUTRAL_PROFILE,
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
  const threads = values.threads === undefined ? undefined : integerOption('threads', values.threads, 1, 256);
  const quality = values.quality === undefined ? undefined : integerOption('quality', values.quality, 1, 100);
  const profile: ProfileDocument = values.profile
    ? await loadDocument(values.profile, validateProfileDocument)
    : NEUTRAL_PROFILE;
  const scanner: ScannerProfile = values.scanner
    ? await loadDocument(values.scanner, validateScannerProfile)
    : LINEAR_SCANNER;

  await mkdir(values.out, { recursive: true });
  // Each file is read once per pass; libvips' operation cache would only hold memory.
  sharp.cache(false);
  const settings: FrameSettings = {
    profile,
    scanner,
    base,
    render: values.render,
    format,
    ...(quality ? { quality } : {}),
  };
  const outputs = outputNames(files, values.out, format);
  const report = reporter(files.length, values.json);
  let failed = 0;
  const todo = [...files.keys()];

  if (values.roll) {
    // First pass: each frame's base; the roll base is their robust median.
    const bases: ReturnType<typeof measureBase>['base'][] = [];
    const fail = (index: number, error: unknown) => {
      if (!(error instanceof ImageInputError || error instanceof FilmBaseError)) throw error;
      failed++;
      todo.splice(todo.indexOf(index), 1);
      report.failure(files[index]!, error);
    };
    for (const index of [...todo]) {
      try {
        bases.push(measureBase(await readNegative(files[index]!), settings).base);
      } catch (error) {
        fail(index, error);
      }
    }
    if (bases.length) {
      const roll = rollBase(bases);
      settings.base = roll;
      // Second pass: every frame's levels against the roll base; one roll-wide E_mid, balance and tone.
      const levels: FrameLevels[] = [];
      for (const index of [...todo]) {
        try {
          levels.push(measureLevels(await readNegative(files[index]!), settings, roll));
        } catch (error) {
          fail(index, error);
        }
      }
      if (levels.length) settings.levels = rollLevels(levels).roll;
    }
  }

  const pool = createInversionPool(threads ? { threads } : {});
  try {
    await runPipelined(todo, FRAMES_IN_FLIGHT, async (index) => {
      try {
        report.success(await invertNegativeFile(pool, files[index]!, outputs[index]!, settings));
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
