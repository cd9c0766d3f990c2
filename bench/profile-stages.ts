// Times each stage of one inversion in process: `tsx bench/profile-stages.ts [--quick]`.
import { performance } from 'node:perf_hooks';
import { parseArgs } from 'node:util';
import { join } from 'node:path';
import sharp from 'sharp';
import { compileInversion } from '@clearbase/inversion';
import { readNegative, writePositive } from '../server/src/imaging/index';
import { createInversionPool } from '../server/src/inversion-pool/inversion-pool';
import { measureFilmBase } from '../server/src/film-base/measure-film-base';
import {
  invertAndWrite,
  inversionParams,
  measureLevels,
} from '../server/src/inversion-pool/invert-negative-file';
import { BENCH_SETTINGS, OUT_DIR, benchNegative } from './bench-negative';

const { values } = parseArgs({ options: { quick: { type: 'boolean', default: false } } });
// 6000 × 4000 = 24 MP as in run.ts; 1500 × 1000 with --quick.
const [width, height] = values.quick ? [1500, 1000] : [6000, 4000];
sharp.cache(false);
const spans: [string, number][] = [];
async function span<T>(name: string, work: () => T | Promise<T>): Promise<T> {
  const start = performance.now();
  const result = await work();
  spans.push([name, performance.now() - start]);
  return result;
}
const file = await span('make negative (once)', () => benchNegative(width, height));
const pool = await span('start pool', () => createInversionPool());
for (let round = 0; round < 2; round++) {
  const negative = await span('read + decode 16-bit', () =>
    readNegative(file, { allocate: (n) => pool.buffers.acquire(Uint16Array, n) }),
  );
  const measured = await span('detect film base', () => measureFilmBase(negative, BENCH_SETTINGS));
  const levels = await span('frame levels', () => measureLevels(negative, BENCH_SETTINGS, measured.base));
  const plan = await span('compile plan', () =>
    compileInversion(inversionParams(BENCH_SETTINGS, measured.base, levels, 8)),
  );
  const out = pool.buffers.acquire(Uint8Array, negative.data.length);
  await span('invert on pool', () =>
    pool.invertFrame(plan, negative.data, out, negative.width, negative.height),
  );
  await span('encode JPEG + write', () =>
    writePositive(out, { path: join(OUT_DIR, 'profile.jpg'), width, height, format: 'jpeg' }),
  );
  // What the product does: the two stages above overlapped, each strip encoded as soon as it is inverted.
  await span('invert + encode overlapped', () =>
    invertAndWrite(pool, plan, negative, out, join(OUT_DIR, 'profile.jpg'), { format: 'jpeg' }, {}),
  );
  // Where (b) − (a) goes beyond the inversion: the decode alone, into sharp's own Buffer (what the floor does),
  // the copy of that Buffer into a pooled shared buffer, and the floor's bare JPEG encode of the same positive.
  const decoded = await span('  of which: decode to Buffer', () =>
    sharp(file, { ignoreIcc: true, sequentialRead: true })
      .removeAlpha()
      .toColourspace('rgb16')
      .raw({ depth: 'ushort' })
      .toBuffer(),
  );
  const copy = pool.buffers.acquire(Uint16Array, decoded.byteLength / 2);
  await span('  of which: copy to shared', () =>
    new Uint8Array(copy.buffer, copy.byteOffset, decoded.byteLength).set(decoded),
  );
  pool.buffers.release(copy);
  await span('  one-pass JPEG, no ICC or meta', () =>
    sharp(out, { raw: { width, height, channels: 3 } })
      .jpeg({ quality: 92, chromaSubsampling: '4:4:4', optimiseCoding: false })
      .toFile(join(OUT_DIR, 'profile-bare.jpg')),
  );
  pool.buffers.release(negative.data);
  pool.buffers.release(out);
}
await pool.close();
for (const [name, ms] of spans) process.stdout.write(`${name.padEnd(32)} ${ms.toFixed(0).padStart(7)} ms\n`);
process.stdout.write(`peak RSS ${Math.round(process.resourceUsage().maxRSS / 1024)} MB\n`);
