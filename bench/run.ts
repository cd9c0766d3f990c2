// Benchmarks of the inversion path, measured side by side in one run. `npm run bench [-- --quick] [-- --reps N]`.
import { execFile } from 'node:child_process';
import { availableParallelism } from 'node:os';
import { join } from 'node:path';
import { mkdir, rm, symlink, writeFile } from 'node:fs/promises';
import { fileURLToPath } from 'node:url';
import { promisify } from 'node:util';
import { parseArgs } from 'node:util';
import { createRequire } from 'node:module';
import sharp from 'sharp';
import { readNegative, writePositive } from '../server/src/imaging/index';
import { createInversionPool } from '../server/src/inversion-pool/inversion-pool';
import { invertNegativeFile } from '../server/src/inversion-pool/invert-negative-file';
import { BENCH_SETTINGS, OUT_DIR, benchNegative } from './bench-negative';
import { sampleInterleaved, timeInterleaved } from './interleave';
import { median } from './median';

const { values } = parseArgs({
  options: {
    quick: { type: 'boolean', default: false },
    reps: { type: 'string' },
    'roll-frames': { type: 'string' },
    // Skips the roll part (minutes at 24 MP) when only the single-frame figures are wanted.
    'no-roll': { type: 'boolean', default: false },
  },
});
const quick = values.quick;
// 6000 × 4000 = 24 MP, a 35 mm frame from a high-resolution scanner; common practice of the trade, from memory.
const [width, height] = quick ? [1500, 1000] : [6000, 4000];
const reps = Number(values.reps ?? (quick ? 5 : 3));
// 36 frames on a 35 mm roll, common practice of the trade; 12 with --quick, or --roll-frames N.
const ROLL = Number(values['roll-frames'] ?? (quick ? 12 : 36));

sharp.cache(false);
const file = await benchNegative(width, height);
const threads = availableParallelism();
const pool = createInversionPool({ threads });
process.stdout.write(
  `negative ${width} × ${height} 16-bit TIFF, ${threads} threads, sharp concurrency ${sharp.concurrency()}, median of ${reps}\n`,
);

// An 8-bit positive of realistic content for the I/O floor's encode (JPEG cost depends on content).
const firstOut = join(OUT_DIR, 'inverted.jpg');
await invertNegativeFile(pool, file, firstOut, BENCH_SETTINGS);
const positive8 = new Uint8Array(await sharp(firstOut).raw().toBuffer());

const cases = {
  ioFloor: async () => {
    // Same decode options as readNegative, so the floor differs from (b) only by the inversion.
    await sharp(file, { limitInputPixels: false, failOn: 'error', ignoreIcc: true, sequentialRead: true })
      .toColourspace('rgb16')
      .raw({ depth: 'ushort' })
      .toBuffer();
    await writePositive(positive8, { path: join(OUT_DIR, 'floor.jpg'), width, height, format: 'jpeg' });
  },
  // The floor read the way (b) reads: the spooled decode into a reused shared buffer (see spooled-decode.ts),
  // against which (b) differs only by measuring and inverting.
  ioFloorAsRead: async () => {
    const negative = await readNegative(file, {
      maxPixels: width * height,
      allocate: (n) => pool.buffers.acquire(Uint16Array, n),
    });
    pool.buffers.release(negative.data);
    await writePositive(positive8, { path: join(OUT_DIR, 'floor.jpg'), width, height, format: 'jpeg' });
  },
  inversion: () => invertNegativeFile(pool, file, firstOut, BENCH_SETTINGS),
  // The same JPEG options as the product's positives, so (b) and (c) differ only in what they compute.
  sharpNegate: () =>
    sharp(file, { limitInputPixels: false, sequentialRead: true })
      .negate()
      .normalise()
      .jpeg({ quality: 92, chromaSubsampling: '4:4:4', optimiseCoding: false })
      .toFile(join(OUT_DIR, 'negate.jpg')),
};
const rounds = await sampleInterleaved(cases, reps);
const t = Object.fromEntries(Object.entries(rounds).map(([name, ms]) => [name, median(ms)]));
// b/a of each round, (a) and (b) run one after the other: drift in the machine's load between rounds cancels out.
const ratiosOf = (floor: string) =>
  rounds['inversion']!.map((b, k) => b / rounds[floor]![k]!).sort((x, y) => x - y);
const roundRatios = ratiosOf('ioFloor');
const roundRatiosAsRead = ratiosOf('ioFloorAsRead');
await pool.close();

// The roll: the real command line, once with --roll over ROLL copies of the negative (symbolic links, so each
// is read and decoded as its own file), against ROLL single runs of the command one after another, each
// paying its own start-up as a lab running one frame at a time would.
const BIN = fileURLToPath(new URL('../bin/clearbase.mjs', import.meta.url));
const rollDir = join(OUT_DIR, 'roll');
await rm(rollDir, { recursive: true, force: true });
await mkdir(join(rollDir, 'in'), { recursive: true });
const rollFiles = await Promise.all(
  Array.from({ length: ROLL }, async (_, i) => {
    const link = join(rollDir, 'in', `frame-${String(i + 1).padStart(2, '0')}.tif`);
    await symlink(file, link);
    return link;
  }),
);
const profileFile = join(rollDir, 'profile.json');
await writeFile(profileFile, JSON.stringify(BENCH_SETTINGS.profile));
const cli = (args: string[]) =>
  promisify(execFile)(process.execPath, [BIN, 'invert', ...args, '--profile', profileFile]);
const roll = values['no-roll']
  ? { pipelined: NaN, oneByOne: NaN }
  : await timeInterleaved(
      {
        pipelined: () => cli([...rollFiles, '--roll', '--out', join(rollDir, 'roll')]),
        oneByOne: async () => {
          for (const f of rollFiles) await cli([f, '--out', join(rollDir, 'single')]);
        },
      },
      1,
      { warmUp: false },
    );
// maxRSS is in kilobytes (Node.js process.resourceUsage docs).
const benchPeakRssMB = Math.round(process.resourceUsage().maxRSS / 1024);

const tsx = createRequire(import.meta.url).resolve('tsx');
const child = await promisify(execFile)(process.execPath, [
  '--import',
  tsx,
  new URL('./invert-once.ts', import.meta.url).pathname,
  file,
  join(OUT_DIR, 'rss.jpg'),
]);
const { peakRssMB } = JSON.parse(child.stdout) as { peakRssMB: number };
// Decode-only check that the file really is 16-bit, so the floor is honest.
const { bitDepth } = await readNegative(file, { maxPixels: width * height });

const ms = (v: number) => `${v.toFixed(0)} ms`;
const rows: [string, string, string][] = [
  ['(a) I/O floor: decode 16-bit + encode 8-bit JPEG', ms(t['ioFloor']!), ''],
  [
    '(b) full inversion via the pool to JPEG',
    ms(t['inversion']!),
    `b/a = ${(t['inversion']! / t['ioFloor']!).toFixed(2)} (goal ≤ 1.2)`,
  ],
  [
    'b/a of each round, (a) and (b) side by side',
    roundRatios[roundRatios.length >> 1]!.toFixed(2),
    `median; ${roundRatios.map((r) => r.toFixed(2)).join(' ')}`,
  ],
  ['(a′) I/O floor read as (b) reads: spooled decode', ms(t['ioFloorAsRead']!), ''],
  [
    'b/a′ of each round, (a′) and (b) side by side',
    roundRatiosAsRead[roundRatiosAsRead.length >> 1]!.toFixed(2),
    `median; ${roundRatiosAsRead.map((r) => r.toFixed(2)).join(' ')}; b/a′ = ${(t['inversion']! / t['ioFloorAsRead']!).toFixed(2)}`,
  ],
  [
    '(c) sharp negate().normalise() to JPEG',
    ms(t['sharpNegate']!),
    `b/c = ${(t['inversion']! / t['sharpNegate']!).toFixed(2)}`,
  ],
  ['peak RSS of (b), own process', `${peakRssMB} MB`, '(goal ≤ 700 MB)'],
  ...(values['no-roll']
    ? []
    : ([
        [
          `${ROLL}-frame roll: clearbase invert --roll`,
          ms(roll['pipelined']!),
          `roll/singles = ${(roll['pipelined']! / roll['oneByOne']!).toFixed(2)} (goal ≤ 0.6)${ROLL === 36 ? '' : `; note: ${ROLL} frames, not 36`}`,
        ],
        [`${ROLL} single runs of clearbase invert, one after another`, ms(roll['oneByOne']!), ''],
      ] as [string, string, string][])),
  ['peak RSS of this whole run (all cases and rolls)', `${benchPeakRssMB} MB`, ''],
];
for (const [name, value, note] of rows)
  process.stdout.write(`${name.padEnd(52)} ${value.padStart(10)}  ${note}\n`);
process.stdout.write(
  `${JSON.stringify({ width, height, bitDepth, threads, reps, ms: t, rounds, roll, ratios: { bOverA: t['inversion']! / t['ioFloor']!, bOverAByRound: roundRatios, bOverAAsRead: t['inversion']! / t['ioFloorAsRead']!, bOverAAsReadByRound: roundRatiosAsRead, bOverC: t['inversion']! / t['sharpNegate']!, rollOverSingles: roll['pipelined']! / roll['oneByOne']! }, peakRssMB, benchPeakRssMB })}\n`,
);
