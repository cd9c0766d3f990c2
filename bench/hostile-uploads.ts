// Memory of upload validation under a burst of hostile scans: `npx tsx bench/hostile-uploads.ts [--files 8]
// [--budget-mb N] [--malloc-arena-max N]`. Eight small deflate TIFFs of 10950 × 10950 16-bit pixels (just inside the
// default pixel limit, about 720 MB each once decoded) are uploaded to a real app at once, one request each, in a child
// process whose RSS and the machine's shared memory (/dev/shm) are sampled from outside every 20 ms.
import { spawn } from 'node:child_process';
import { existsSync, readFileSync } from 'node:fs';
import { mkdir } from 'node:fs/promises';
import { createRequire } from 'node:module';
import { join } from 'node:path';
import { parseArgs } from 'node:util';
import sharp from 'sharp';
import { OUT_DIR } from './bench-negative';

const { values } = parseArgs({
  options: {
    files: { type: 'string', default: '8' },
    side: { type: 'string', default: '10950' },
    'budget-mb': { type: 'string' },
    'malloc-arena-max': { type: 'string' },
    // Turns libvips' operation cache off in the server (sharp.cache(false)), as the command line does.
    'no-sharp-cache': { type: 'boolean', default: false },
  },
});
const count = Number(values.files);
// 10950² = 119.9 MP, just under the default UPLOAD_MAX_PIXELS of 120 MP (server/src/config/config.ts).
const side = Number(values.side);

/** A flat-coloured 16-bit deflate TIFF: tiny on disk, width × height × 6 bytes once decoded. Made once. */
async function hostileTiff(i: number): Promise<string> {
  await mkdir(OUT_DIR, { recursive: true });
  const path = join(OUT_DIR, `hostile-${side}-${i}.tif`);
  if (!existsSync(path)) {
    await sharp({
      create: { width: side, height: side, channels: 3, background: { r: 200 - 9 * i, g: 120, b: 80 } },
    })
      .toColourspace('rgb16')
      .tiff({ compression: 'deflate', predictor: 'horizontal' })
      .toFile(path);
  }
  return path;
}

const files: string[] = [];
for (let i = 0; i < count; i++) files.push(await hostileTiff(i));

const env: NodeJS.ProcessEnv = { ...process.env };
if (values['budget-mb'] !== undefined) env['UPLOAD_VALIDATION_MEMORY_MB'] = values['budget-mb'];
if (values['malloc-arena-max'] !== undefined) env['MALLOC_ARENA_MAX'] = values['malloc-arena-max'];
if (values['no-sharp-cache']) env['BENCH_SHARP_CACHE'] = 'off';
const tsx = createRequire(import.meta.url).resolve('tsx');
const child = spawn(
  process.execPath,
  ['--expose-gc', '--import', tsx, new URL('./hostile-uploads-burst.ts', import.meta.url).pathname, ...files],
  { env, stdio: ['ignore', 'pipe', 'inherit'] },
);

const kib = (text: string, field: string) =>
  Number(new RegExp(`^${field}:\\s+(\\d+) kB`, 'm').exec(text)?.[1] ?? 0);
const shmem = () => kib(readFileSync('/proc/meminfo', 'utf8'), 'Shmem');
const shmemAtStart = shmem();
let phase = 'start';
let peakRss = 0;
let peakShm = 0;
const sampler = setInterval(() => {
  try {
    if (phase !== 'burst') return;
    peakRss = Math.max(peakRss, kib(readFileSync(`/proc/${child.pid}/status`, 'utf8'), 'VmRSS'));
    peakShm = Math.max(peakShm, shmem() - shmemAtStart);
  } catch {
    // the child has just exited
  }
}, 20);
let report: Record<string, unknown> = {};
let pending = '';
child.stdout.on('data', (chunk: Buffer) => {
  pending += chunk.toString();
  let nl;
  while ((nl = pending.indexOf('\n')) >= 0) {
    const line = JSON.parse(pending.slice(0, nl)) as { phase: string } & Record<string, unknown>;
    pending = pending.slice(nl + 1);
    phase = line.phase;
    if (phase === 'done') report = line;
  }
});
const code = await new Promise<number | null>((resolve) => child.on('exit', resolve));
clearInterval(sampler);
if (code !== 0) throw new Error(`the burst's child process failed (exit ${code})`);
const mb = (k: number) => Math.round(k / 1024);
process.stdout.write(
  [
    `${count} uploads at once of a ${side} × ${side} 16-bit deflate TIFF (${Math.round(readFileSync(files[0]!).length / 1024)} KB each)`,
    `budget ${values['budget-mb'] ?? 'default'} MB, MALLOC_ARENA_MAX ${values['malloc-arena-max'] ?? 'unset'}, libvips cache ${values['no-sharp-cache'] ? 'off' : 'on'}`,
    `RSS before the burst ${report['before']} MB`,
    `peak RSS during it   ${report['peak']} MB (sampled: ${mb(peakRss)} MB); /dev/shm grew by up to ${mb(peakShm)} MB`,
    `RSS settled after it ${report['after']} MB; removed files still held open: ${report['heldDeleted']}`,
    `burst took           ${report['burstMs']} ms: ${JSON.stringify(report['results'])}`,
  ].join('\n') + '\n',
);
