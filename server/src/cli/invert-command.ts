import { mkdir } from 'node:fs/promises';
import { basename, extname, join } from 'node:path';
import sharp from 'sharp';
import type { z } from 'zod';
import { ImageInputError, POSITIVE_EXTENSIONS, readNegative, type PositiveFormat } from '../imaging/index';
import { createInversionPool } from '../inversion-pool/inversion-pool';
import { runPipelined } from '../inversion-pool/run-pipelined';
import {
  invertNegativeFile,
  measureFrame,
  type FrameResult,
  type FrameSettings,
} from '../inversion-pool/invert-negative-file';
import {
  LINEAR_SCANNER,
  NEUTRAL_STOCK,
  rollBase,
  rollLevels,
  scannerProfileSchema,
  stockProfileSchema,
  type Region,
  type Rgb,
} from '../inversion-pool/inversion-kernel';
import { parseCommandArgs } from './parse-command-args';
import { readDocument } from './profile-document';
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
  const stock = values.profile ? await loadDocument(values.profile, stockProfileSchema) : NEUTRAL_STOCK;
  const scanner = values.scanner ? await loadDocument(values.scanner, scannerProfileSchema) : LINEAR_SCANNER;

  await mkdir(values.out, { recursive: true });
  // Each file is read once per pass; libvips' operation cache would only hold memory.
  sharp.cache(false);
  const settings: FrameSettings = {
    stock,
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
    // First pass: each frame's base and levels; the roll base is their robust median.
    const measured: {
      index: number;
      base: ReturnType<typeof measureFrame>['base'];
      levels: { shadow: Rgb; highlight: Rgb };
    }[] = [];
    for (const index of [...todo]) {
      try {
        const negative = await readNegative(files[index]!);
        const m = measureFrame(negative, settings);
        measured.push({ index, base: m.base, levels: m.levels });
      } catch (error) {
        failed++;
        todo.splice(todo.indexOf(index), 1);
        report.failure(files[index]!, error);
      }
    }
    if (measured.length) {
      const roll = rollBase(measured.map((m) => m.base));
      // D = log10(B / L): moving from a frame's base to the roll base shifts its densities by log10(B_roll / B_frame).
      const shifted = measured.map((m) => {
        const shift = [0, 1, 2].map((c) => Math.log10(roll.rgb[c]! / m.base.rgb[c]!)) as Rgb;
        const add = (v: Rgb) => v.map((x, c) => x + shift[c]!) as Rgb;
        return { shadow: add(m.levels.shadow), highlight: add(m.levels.highlight) };
      });
      settings.base = roll;
      settings.levels = rollLevels(shifted);
    }
  }

  const pool = createInversionPool(threads ? { threads } : {});
  try {
    await runPipelined(todo, FRAMES_IN_FLIGHT, async (index) => {
      try {
        report.success(await invertNegativeFile(pool, files[index]!, outputs[index]!, settings));
      } catch (error) {
        if (!(error instanceof ImageInputError)) throw error;
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

async function loadDocument<S extends z.ZodType>(path: string, schema: S): Promise<z.output<S>> {
  const result = await readDocument(path, schema);
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
      const code = error instanceof ImageInputError ? error.code : 'failed';
      const message = error instanceof Error ? error.message : String(error);
      if (json) process.stdout.write(`${JSON.stringify({ file, error: { code, message } })}\n`);
      process.stderr.write(`clearbase: ${file}: ${message}\n`);
    },
  };
}
