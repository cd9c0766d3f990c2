import { spawn } from 'node:child_process';
import { mkdtemp, readdir, readFile, rm, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import sharp from 'sharp';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import {
  exposeNegative,
  LINEAR_SCANNER,
  MID_GREY,
  POLYCLEAR_200,
  profileForStock,
  srgbDecode,
  TINTLINE_400,
} from '@clearbase/inversion';
import { readPositiveMetadata } from '../imaging/index';
import { writeNegativeTiff } from './synth-command';

const BIN = fileURLToPath(new URL('../../../bin/clearbase.mjs', import.meta.url));

interface CliRun {
  code: number | null;
  stdout: string;
  stderr: string;
}

/** Spawns the real command line, as a user would, from `cwd`. */
function runCli(args: string[], cwd = process.cwd()): Promise<CliRun> {
  return new Promise((resolve, reject) => {
    const child = spawn(process.execPath, [BIN, ...args], { cwd, stdio: ['ignore', 'pipe', 'pipe'] });
    let stdout = '';
    let stderr = '';
    child.stdout.on('data', (d: Buffer) => (stdout += d.toString()));
    child.stderr.on('data', (d: Buffer) => (stderr += d.toString()));
    child.on('error', reject);
    child.on('close', (code) => resolve({ code, stdout, stderr }));
  });
}

describe('clearbase command line', () => {
  it('prints the usage text and exits 2 when run without a command', async () => {
    const run = await runCli([]);
    expect(run.code).toBe(2);
    expect(run.stderr).toMatch(/Usage:/);
  });

  it('exits 2 with the usage text for an unknown command', async () => {
    const run = await runCli(['develop']);
    expect(run.code).toBe(2);
    expect(run.stderr).toMatch(/Unknown command "develop"/);
    expect(run.stderr).toMatch(/clearbase invert/);
  });

  it('prints help on stdout and exits 0', async () => {
    const run = await runCli(['--help']);
    expect(run.code).toBe(0);
    expect(run.stdout).toMatch(/clearbase synth/);
  });
});

describe('clearbase synth, invert and profile validate', () => {
  let dir: string;
  let negatives: string[];
  beforeAll(async () => {
    dir = await mkdtemp(join(tmpdir(), 'clearbase-cli-'));
    const run = await runCli(
      [
        'synth',
        '--out',
        'neg',
        '--frames',
        '3',
        '--stock',
        'clearbase-tintline-400',
        '--width',
        '240',
        '--height',
        '160',
      ],
      dir,
    );
    expect(run.code).toBe(0);
    negatives = run.stdout.trim().split('\n');
  }, 60_000);
  afterAll(async () => {
    await rm(dir, { recursive: true, force: true });
  });

  it('synth writes 16-bit TIFF negatives', async () => {
    expect(negatives).toEqual([
      'neg/clearbase-tintline-400-frame-01.tif',
      'neg/clearbase-tintline-400-frame-02.tif',
      'neg/clearbase-tintline-400-frame-03.tif',
    ]);
    const meta = await sharp(join(dir, negatives[0]!)).metadata();
    expect(meta).toMatchObject({ format: 'tiff', width: 240, height: 160, depth: 'ushort' });
  });

  it('synth writes chart negatives named for the scene, and refuses an unknown scene with exit 2', async () => {
    const run = await runCli(
      ['synth', '--out', 'charts', '--scene', 'chart', '--frames', '1', '--width', '120', '--height', '90'],
      dir,
    );
    expect(run.code).toBe(0);
    expect(run.stdout.trim()).toBe('charts/clearbase-polyclear-200-chart-frame-01.tif');
    const meta = await sharp(join(dir, run.stdout.trim())).metadata();
    expect(meta).toMatchObject({ width: 120, height: 90, depth: 'ushort' });
    const bad = await runCli(['synth', '--out', 'charts', '--scene', 'portrait'], dir);
    expect(bad.code).toBe(2);
    expect(bad.stderr).toMatch(
      /Expected one of outdoor, chart, grey-steps, gradient for --scene but received portrait/,
    );
  });

  it('inverts every frame, printing one JSON line each, and exits 0', async () => {
    const run = await runCli(['invert', ...negatives, '--out', 'pos', '--json'], dir);
    expect(run.code).toBe(0);
    const lines = run.stdout
      .trim()
      .split('\n')
      .map((l) => JSON.parse(l) as Record<string, unknown>);
    expect(lines.map((l) => l['file']).sort()).toEqual(negatives);
    for (const line of lines) {
      expect(line).toMatchObject({
        output: expect.stringMatching(/^pos\/clearbase-tintline-400-frame-0\d\.jpg$/),
        warnings: [],
      });
      const base = line['base'] as { rgb: number[]; region: number[]; confidence: number };
      expect(base.rgb).toHaveLength(3);
      for (const v of base.rgb) {
        expect(v).toBeGreaterThan(0);
        expect(v).toBeLessThanOrEqual(1);
      }
      expect(base.region).toHaveLength(4);
      expect(base.confidence).toBeGreaterThan(0.5);
      expect(typeof line['ms']).toBe('number');
    }
    expect((await readdir(join(dir, 'pos'))).sort()).toEqual([
      'clearbase-tintline-400-frame-01.jpg',
      'clearbase-tintline-400-frame-02.jpg',
      'clearbase-tintline-400-frame-03.jpg',
    ]);
  });

  it('writes 16-bit TIFF positives for a roll with one shared base and the profile in the metadata', async () => {
    await writeFile(
      join(dir, 'stock.json'),
      JSON.stringify({ ...profileForStock(TINTLINE_400), version: 2 }),
    );
    const run = await runCli(
      [
        'invert',
        ...negatives,
        '--out',
        'roll',
        '--roll',
        '--format',
        'tiff16',
        '--profile',
        'stock.json',
        '--json',
      ],
      dir,
    );
    expect(run.code).toBe(0);
    const lines = run.stdout
      .trim()
      .split('\n')
      .map((l) => JSON.parse(l) as { base: { rgb: number[] }; output: string });
    expect(new Set(lines.map((l) => JSON.stringify(l.base.rgb))).size).toBe(1);
    const read = await readPositiveMetadata(join(dir, lines[0]!.output));
    expect(read.bitDepth).toBe(16);
    expect(read.metadata).toMatchObject({
      stock: 'Clearbase Tintline 400',
      profileVersion: 'clearbase-tintline-400@2',
    });
  });

  it('exits 1 when one negative is truncated, writing all the others', async () => {
    const whole = await readFile(join(dir, negatives[1]!));
    await writeFile(join(dir, 'neg', 'cut.tif'), whole.subarray(0, whole.length >> 1));
    const run = await runCli(
      ['invert', negatives[0]!, 'neg/cut.tif', negatives[2]!, '--out', 'mixed', '--json'],
      dir,
    );
    expect(run.code).toBe(1);
    const lines = run.stdout
      .trim()
      .split('\n')
      .map((l) => JSON.parse(l) as { file: string; error?: { code: string } });
    expect(lines.find((l) => l.file === 'neg/cut.tif')?.error?.code).toBe('truncated');
    expect(run.stderr).toMatch(/cut\.tif: The file starts like a TIFF image/);
    expect((await readdir(join(dir, 'mixed'))).sort()).toEqual([
      'clearbase-tintline-400-frame-01.jpg',
      'clearbase-tintline-400-frame-03.jpg',
    ]);
  });

  it('samples the base from a rectangle drawn by the operator', async () => {
    const run = await runCli(
      ['invert', negatives[0]!, '--out', 'drawn', '--base', '10,0,50,4', '--json'],
      dir,
    );
    expect(run.code).toBe(0);
    const line = JSON.parse(run.stdout.trim()) as { base: { region: number[]; confidence: number } };
    expect(line.base.region).toEqual([10, 0, 50, 4]);
    expect(line.base.confidence).toBeGreaterThan(0.5);
  });

  it('exits 2 with the usage text for a bad option value', async () => {
    const run = await runCli(['invert', negatives[0]!, '--out', 'x', '--format', 'gif'], dir);
    expect(run.code).toBe(2);
    expect(run.stderr).toMatch(/Expected one of jpeg, tiff16, png16 for --format but received gif/);
    expect(run.stderr).toMatch(/Usage:/);
  });

  it('validates a good profile with exit 0 and lists each error of a bad one with its path', async () => {
    const good = profileForStock(TINTLINE_400);
    await writeFile(join(dir, 'good.json'), JSON.stringify(good));
    const points = good.curves.red.points.map((p, i) => (i === 2 ? { ...p, density: -1 } : p));
    await writeFile(
      join(dir, 'bad.json'),
      JSON.stringify({
        ...good,
        stock: { ...good.stock, name: '' },
        curves: { ...good.curves, red: { points } },
        crosstalk: [1, 0],
      }),
    );
    const valid = await runCli(['profile', 'validate', 'good.json'], dir);
    expect(valid.code).toBe(0);
    expect(valid.stdout).toMatch(
      /valid stock profile "Clearbase Tintline 400" \(clearbase-tintline-400\) version 1/,
    );
    const bad = await runCli(['profile', 'validate', 'bad.json'], dir);
    expect(bad.code).toBe(1);
    expect(bad.stderr).toMatch(/^bad\.json: stock\.name: /m);
    expect(bad.stderr).toMatch(/^bad\.json: curves\.red\.points\[2\]\.density: /m);
    expect(bad.stderr).toMatch(/^bad\.json: crosstalk: /m);
  });
});

describe('clearbase invert --exposure', () => {
  let dir: string;
  beforeAll(async () => {
    dir = await mkdtemp(join(tmpdir(), 'clearbase-exposure-'));
    await writeFile(join(dir, 'stock.json'), JSON.stringify(profileForStock(POLYCLEAR_200)));
    // Grey cards filling the frame between unexposed rebate strips: 18 % and one stop darker (9 %).
    for (const [name, reflectance] of [
      ['grey', MID_GREY],
      ['dark', MID_GREY / 2],
    ] as const) {
      const scene = { width: 64, height: 48, rgb: new Float32Array(64 * 48 * 3).fill(reflectance) };
      const negative = exposeNegative(scene, { stock: POLYCLEAR_200, scanner: LINEAR_SCANNER, rebate: 8 });
      await writeNegativeTiff(join(dir, `${name}.tif`), negative.data, negative.width, negative.height);
    }
  }, 60_000);
  afterAll(async () => {
    await rm(dir, { recursive: true, force: true });
  });

  /** Inverts with the reference rendering into 16-bit PNG; answers each frame's JSON line and its centre's linear grey. */
  async function invert(files: string[], out: string, ...options: string[]) {
    const run = await runCli(
      [
        'invert',
        ...files,
        '--out',
        out,
        '--profile',
        'stock.json',
        '--render',
        'reference',
        '--format',
        'png16',
        '--json',
        ...options,
      ],
      dir,
    );
    expect(run.stderr).toBe('');
    expect(run.code).toBe(0);
    const lines = run.stdout
      .trim()
      .split('\n')
      .map(
        (l) =>
          JSON.parse(l) as {
            file: string;
            output: string;
            exposure: { midLogExposure: number; source: string; stops: number };
          },
      );
    lines.sort((a, b) => files.indexOf(a.file) - files.indexOf(b.file));
    const greys = await Promise.all(
      lines.map(async (line) => {
        const { data } = await sharp(join(dir, line.output))
          .extract({ left: 24, top: 24, width: 16, height: 16 })
          .raw()
          .toBuffer({ resolveWithObject: true });
        const pixels = new Uint16Array(data.buffer, data.byteOffset, data.byteLength / 2);
        let sum = 0;
        for (let i = 1; i < pixels.length; i += 3) sum += srgbDecode(pixels[i]! / 65535);
        return sum / (pixels.length / 3);
      }),
    );
    return { lines, greys };
  }

  it('prints a grey card shot at the meter’s reading as 18 % grey at the metered exposure', async () => {
    const { lines, greys } = await invert(['grey.tif'], 'metered', '--exposure', 'metered');
    expect(greys[0]).toBeCloseTo(MID_GREY, 2);
    expect(lines[0]!.exposure).toEqual({
      midLogExposure: Number(Math.log10(MID_GREY).toFixed(6)),
      source: 'metered',
      stops: 0,
    });
  });

  it('prints one stop lighter with --exposure-stops 1', async () => {
    const { lines, greys } = await invert(
      ['grey.tif'],
      'lighter',
      '--exposure',
      'metered',
      '--exposure-stops',
      '1',
    );
    expect(greys[0]! / MID_GREY).toBeCloseTo(2, 1);
    expect(lines[0]!.exposure.stops).toBe(1);
    expect(lines[0]!.exposure.midLogExposure).toBeCloseTo(Math.log10(MID_GREY) - Math.log10(2), 5);
  });

  it('keeps a darker card a stop darker at the metered exposure, where each frame’s levels lift it towards mid grey', async () => {
    const metered = await invert(['grey.tif', 'dark.tif'], 'fixed', '--exposure', 'metered', '--roll');
    expect(metered.greys[1]! / metered.greys[0]!).toBeCloseTo(0.5, 1);
    expect(metered.lines.map((l) => l.exposure.source)).toEqual(['metered', 'metered']);
    const auto = await invert(['grey.tif', 'dark.tif'], 'auto');
    // Each frame's levels (measured with the rebate in view) lift the dark card most of the way to mid grey.
    expect(auto.greys[1]! / auto.greys[0]!).toBeGreaterThan(0.75);
    expect(auto.lines.map((l) => l.exposure.source)).toEqual(['frame-levels', 'frame-levels']);
    const roll = await invert(['grey.tif', 'dark.tif'], 'roll', '--roll');
    expect(roll.lines.map((l) => l.exposure.source)).toEqual(['roll-levels', 'roll-levels']);
  });

  it('refuses stops off the 1/6-stop steps or beyond 6 stops, and an unknown exposure, with exit 2', async () => {
    for (const stops of ['0.1', '7', 'one']) {
      const run = await runCli(['invert', 'grey.tif', '--out', 'x', '--exposure-stops', stops], dir);
      expect(run.code).toBe(2);
      expect(run.stderr).toContain(
        `Expected a multiple of 1/6 stop between -6 and 6 for --exposure-stops but received ${stops}.`,
      );
    }
    const run = await runCli(['invert', 'grey.tif', '--out', 'x', '--exposure', 'bright'], dir);
    expect(run.code).toBe(2);
    expect(run.stderr).toContain('Expected auto or metered for --exposure but received bright.');
  });
});
