// Child process of bench/hostile-uploads.ts: a real app on a fresh database receives the given scans as uploads all at
// once, one request each, and reports what was accepted, how long the burst took and the RSS before and after it.
import { setTimeout as sleep } from 'node:timers/promises';
import { createTestApp } from '../server/src/test-support/test-app';
import { addTestLab } from '../server/src/test-support/test-lab';
import { readdirSync, readlinkSync } from 'node:fs';
import { readFile } from 'node:fs/promises';
import sharp from 'sharp';
import { basename } from 'node:path';

const files = process.argv.slice(2);
if (!files.length) throw new Error('usage: hostile-uploads-burst <scan.tif>...');
// The parent passes the server's settings (UPLOAD_VALIDATION_MEMORY_MB...) through the environment.
const env = Object.fromEntries(
  Object.entries(process.env).filter(([name]) => name.startsWith('UPLOAD_')),
) as Record<string, string>;
if (process.env['BENCH_SHARP_CACHE'] === 'off') sharp.cache(false);
const t = await createTestApp(env);
const lab = await addTestLab(t);
const scans = await Promise.all(files.map((f) => readFile(f)));
const rolls = await Promise.all(scans.map(() => lab.newRoll()));
const mb = (bytes: number) => Math.round(bytes / 2 ** 20);
const before = mb(process.memoryUsage().rss);
process.stdout.write(`${JSON.stringify({ phase: 'burst' })}\n`);
const started = performance.now();
const results = await Promise.all(
  scans.map((scan, i) =>
    lab.operator
      .send('post', `/api/rolls/${rolls[i]!.roll}/frames`)
      .attach('files', scan, basename(files[i]!))
      .then((res) => (res.status === 201 ? `accepted` : `${res.status} ${res.body.code ?? ''}`)),
  ),
);
const burstMs = Math.round(performance.now() - started);
process.stdout.write(`${JSON.stringify({ phase: 'settle' })}\n`);
// Settled: what the process still holds once the burst is over, after a garbage collection where it is exposed.
await sleep(3000);
(globalThis as { gc?: () => void }).gc?.();
await sleep(1000);
const after = mb(process.memoryUsage().rss);
// Files this process still holds open though they were removed (uploads' temp files kept open by libvips' cache).
const heldDeleted = readdirSync('/proc/self/fd').filter((fd) => {
  try {
    return readlinkSync(`/proc/self/fd/${fd}`).endsWith('(deleted)');
  } catch {
    return false;
  }
}).length;
await t.close();
// maxRSS is in kilobytes (Node.js process.resourceUsage docs).
const peak = Math.round(process.resourceUsage().maxRSS / 1024);
process.stdout.write(
  `${JSON.stringify({ phase: 'done', before, peak, after, heldDeleted, burstMs, results })}\n`,
);
