import { spawn } from 'node:child_process';
import { mkdtemp, readFile, rm, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import sharp from 'sharp';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { validateProfileDocument } from '@clearbase/contracts';
import { calibrationRoll, LINEAR_SCANNER, TINTLINE_400, type FilmStock } from '@clearbase/inversion';
import { writeNegativeTiff } from './synth-command';

const BIN = fileURLToPath(new URL('../../../bin/clearbase.mjs', import.meta.url));

/** Spawns `clearbase calibrate` with `args`, as a user would, from `cwd`. */
function runCalibrate(
  args: string[],
  cwd: string,
): Promise<{ code: number | null; stdout: string; stderr: string }> {
  return new Promise((resolve, reject) => {
    const child = spawn(process.execPath, [BIN, 'calibrate', ...args], {
      cwd,
      stdio: ['ignore', 'pipe', 'pipe'],
    });
    let stdout = '';
    let stderr = '';
    child.stdout.on('data', (d: Buffer) => (stdout += d.toString()));
    child.stderr.on('data', (d: Buffer) => (stderr += d.toString()));
    child.on('error', reject);
    child.on('close', (code) => resolve({ code, stdout, stderr }));
  });
}

// An invented stock whose curves bend inside the bracket, with a tinted base and crosstalk.
const STOCK: FilmStock = {
  ...TINTLINE_400,
  name: 'Command line test 400',
  gamma: [0.55, 0.62, 0.7],
  toe: [-2.1, -2.05, -2.0],
  maxDensity: [2.0, 2.1, 2.2],
  softness: 0.2,
};

describe('clearbase calibrate', () => {
  let dir: string;
  let bracketArgs: string[];
  let chartArgs: string[];
  let chartRegion: string;
  let roll: ReturnType<typeof calibrationRoll>;
  beforeAll(async () => {
    dir = await mkdtemp(join(tmpdir(), 'clearbase-calibrate-'));
    roll = calibrationRoll({
      stock: STOCK,
      scanner: LINEAR_SCANNER,
      stops: Array.from({ length: 15 }, (_, i) => i - 6),
      greySize: 32,
    });
    const files = roll.brackets.map((_, i) => `grey-${String(i + 1).padStart(2, '0')}.tif`);
    await Promise.all(
      roll.brackets.map((b, i) =>
        writeNegativeTiff(join(dir, files[i]!), b.negative.data, b.negative.width, b.negative.height),
      ),
    );
    bracketArgs = roll.brackets.flatMap((b, i) => ['--bracket', `${files[i]}:${b.stops}`]);
    const c = roll.chart;
    await sharp(c.data, { raw: { width: c.width, height: c.height, channels: 3 } })
      .toColourspace('rgb16')
      .png()
      .toFile(join(dir, 'chart.png'));
    await writeNegativeTiff(
      join(dir, 'leader.tif'),
      roll.chart.data.slice(0, roll.chart.width * 6 * 3),
      roll.chart.width,
      6,
    );
    chartArgs = ['--chart', 'chart.png', '--chart-corners', roll.chartCorners.flat().join(',')];
    const over = calibrationRoll({ stock: STOCK, scanner: LINEAR_SCANNER, stops: [0], chartStops: 2 }).chart;
    await writeNegativeTiff(join(dir, 'chart-over.tif'), over.data, over.width, over.height);
    chartRegion = roll.chartRegion.join(',');
  }, 60_000);
  afterAll(async () => {
    await rm(dir, { recursive: true, force: true });
  });

  it('fits a roll of 16-bit TIFF grey frames and a 16-bit PNG chart, writes a valid profile and exits 0', async () => {
    const run = await runCalibrate(
      [
        ...bracketArgs,
        ...chartArgs,
        '--stock',
        STOCK.name,
        '--iso',
        '400',
        '--film-base',
        'tinted',
        '--out',
        'out/p.json',
        '--json',
      ],
      dir,
    );
    expect(run.stderr).toBe('');
    expect(run.code).toBe(0);
    const report = JSON.parse(run.stdout) as {
      gamma: number[];
      ei: number;
      exposureMatrix: number[][];
      deltaE: { after: { mean: number }; crossValidated: { mean: number } };
      grid: { sample: number[][] }[];
      warnings: { severity: string }[];
    };
    report.gamma.forEach((g, c) => expect(Math.abs(g / STOCK.gamma[c]! - 1)).toBeLessThan(0.03));
    expect(report.deltaE.after.mean).toBeLessThan(1);
    expect(report.deltaE.crossValidated.mean).toBeLessThan(1.5);
    // The neutral axis is held: each row of the exposure matrix sums to 1.
    report.exposureMatrix.forEach((row) => expect(row[0]! + row[1]! + row[2]!).toBeCloseTo(1, 9));
    expect(report.grid).toHaveLength(24);
    expect(report.grid[0]!.sample).toHaveLength(4);
    const profile = validateProfileDocument(JSON.parse(await readFile(join(dir, 'out/p.json'), 'utf8')));
    expect(profile.ok).toBe(true);
    if (profile.ok) expect(profile.value.stock).toMatchObject({ name: STOCK.name, iso: 400, base: 'tinted' });
  }, 60_000);

  it('prints a readable summary without --json, the chart marked by its region', async () => {
    const run = await runCalibrate(
      [...bracketArgs, '--chart', 'chart.png', '--chart-region', chartRegion, '--out', 'q.json'],
      dir,
    );
    expect(run.code).toBe(0);
    expect(run.stdout).toMatch(
      /^profile written to q\.json\nγ \(red, green, blue\): 0\.5\d\d, 0\.6\d\d, 0\.\d+\n/,
    );
    expect(run.stdout).toMatch(/EI \d+/);
  }, 60_000);

  it('reports the fitted and the cross-validated ΔE00 and both matrices, and fits a second chart frame', async () => {
    const run = await runCalibrate(
      [...bracketArgs, ...chartArgs, '--more-chart', 'chart-over.tif:+2', '--out', 'two.json'],
      dir,
    );
    expect(run.stderr).toBe('');
    expect(run.code).toBe(0);
    expect(run.stdout).toMatch(/^crosstalk \(density\): \[1\.\d{3}, -?0\.\d{3}, -?0\.\d{3}\] /m);
    expect(run.stdout).toMatch(/^exposure matrix \(film exposures → linear sRGB\): \[/m);
    const line =
      /fitted mean (\d\.\d\d) max \d\.\d\d; cross-validated \(each patch by a fit without it\) mean (\d\.\d\d)/.exec(
        run.stdout,
      );
    expect(Number(line?.[1])).toBeLessThan(1);
    expect(Number(line?.[2])).toBeLessThan(1.5);
    expect(run.stdout).toMatch(
      /^neutral row after the profile: largest \|Δa\*\| 0\.\d\d, \|Δb\*\| 0\.\d\d$/m,
    );
    expect(run.stdout).toMatch(
      /^chart frame 1: exposure [+-]0\.0\d stops, \d+ patches fitted, ΔE00 mean 0\.\d\d/m,
    );
    expect(run.stdout).toMatch(
      /^chart frame 2: exposure \+[12]\.\d\d stops \(labelled \+2\.00\), \d+ patches fitted/m,
    );
    const profile = validateProfileDocument(JSON.parse(await readFile(join(dir, 'two.json'), 'utf8')));
    expect(profile.ok).toBe(true);
    // The profile carries the fitted exposure-space matrix, so it renders as the report measured it.
    if (profile.ok) expect(profile.value.exposureMatrix).toHaveLength(3);
  }, 60_000);

  it('takes the film base from a leader frame when given one', async () => {
    const run = await runCalibrate(
      [...bracketArgs, ...chartArgs, '--leader', 'leader.tif', '--out', 'l.json', '--json'],
      dir,
    );
    expect(run.code).toBe(0);
    const report = JSON.parse(run.stdout) as { base: { region: number[] } };
    expect(report.base.region).toEqual([0, 0, 120, 6]);
  }, 60_000);

  it('writes the profile but exits 1 with the reason when only four grey frames are given', async () => {
    const run = await runCalibrate(
      [...bracketArgs.slice(12, 20) /* 0 … +3 stops */, ...chartArgs, '--out', 'few.json'],
      dir,
    );
    expect(run.code).toBe(1);
    expect(run.stderr).toMatch(/warning: Only 4 usable grey frames: at least 5 are needed/);
    expect(validateProfileDocument(JSON.parse(await readFile(join(dir, 'few.json'), 'utf8'))).ok).toBe(true);
  }, 60_000);

  it('exits 1 naming the file when a grey frame cannot be read', async () => {
    await writeFile(join(dir, 'not-an-image.tif'), 'hello');
    const run = await runCalibrate(
      ['--bracket', 'not-an-image.tif:0', ...bracketArgs, ...chartArgs, '--out', 'x.json'],
      dir,
    );
    expect(run.code).toBe(1);
    expect(run.stderr).toMatch(/not-an-image\.tif: The file is not an image/);
  }, 60_000);

  it('exits 2 with the usage text for a missing chart or a bracket without stops', async () => {
    const noChart = await runCalibrate([...bracketArgs, '--out', 'x.json'], dir);
    expect(noChart.code).toBe(2);
    expect(noChart.stderr).toMatch(/Missing --chart FILE/);
    const both = await runCalibrate(
      [...bracketArgs, ...chartArgs, '--chart-region', chartRegion, '--out', 'x.json'],
      dir,
    );
    expect(both.code).toBe(2);
    expect(both.stderr).toMatch(/Give exactly one of --chart-region/);
    const noStops = await runCalibrate(['--bracket', 'grey-01.tif', ...chartArgs, '--out', 'x.json'], dir);
    expect(noStops.code).toBe(2);
    expect(noStops.stderr).toMatch(/Expected FILE:STOPS .* for --bracket but received grey-01\.tif/);
    expect(noStops.stderr).toMatch(/clearbase calibrate --bracket/);
  }, 60_000);

  it('samples each grey frame in its own rectangle where --bracket gives one, the shared one elsewhere', async () => {
    // the shared rectangle lies on the rebate, unexposed film: frames sampled there never saw light
    const rebate = roll.baseRegion.join(',');
    const own = roll.greyRegion.join(',');
    const perFrame = roll.brackets.flatMap((b, i) => [
      '--bracket',
      `grey-${String(i + 1).padStart(2, '0')}.tif:${b.stops}${i % 4 ? `:${own}` : ''}`,
    ]);
    const run = await runCalibrate(
      [...perFrame, ...chartArgs, '--grey-region', rebate, '--out', 'own.json', '--json'],
      dir,
    );
    const report = JSON.parse(run.stdout) as { gamma: number[]; usedFrames: number[] };
    // the four frames left on the shared rectangle are blank and left out; the others fit the stock's γ
    expect(report.usedFrames.filter((i) => i % 4 === 0)).toEqual([]);
    expect(report.usedFrames.length).toBeGreaterThanOrEqual(9);
    report.gamma.forEach((g, c) => expect(Math.abs(g / STOCK.gamma[c]! - 1)).toBeLessThan(0.03));

    const shared = await runCalibrate(
      [...bracketArgs, ...chartArgs, '--grey-region', rebate, '--out', 'shared.json', '--json'],
      dir,
    );
    expect(shared.code).toBe(1);
  }, 60_000);

  it('exits 2 with the usage text for a grey rectangle that is not x,y,w,h or runs past its frame', async () => {
    for (const bad of ['grey-01.tif:0:1,2,3', 'grey-01.tif:0:4,4,0,8', 'grey-01.tif:+1:corner']) {
      const run = await runCalibrate(
        ['--bracket', bad, ...bracketArgs, ...chartArgs, '--out', 'x.json'],
        dir,
      );
      expect(run.code, bad).toBe(2);
      expect(run.stderr).toContain(`for the grey rectangle of --bracket ${bad} but received`);
      expect(run.stderr).toMatch(/clearbase calibrate --bracket FILE:STOPS\[:x,y,w,h\]/);
    }
    const past = await runCalibrate(
      ['--bracket', 'grey-01.tif:0:20,20,40,10', ...bracketArgs, ...chartArgs, '--out', 'x.json'],
      dir,
    );
    expect(past.code).toBe(2);
    expect(past.stderr).toContain(
      `The grey rectangle 20,20,40,10 of grey-01.tif runs past the frame's 32 × ${32 + 12} pixels.`,
    );
  }, 60_000);
});
