// Child process of the benchmark: inverts one negative to JPEG via the pool and reports its peak RSS.
import sharp from 'sharp';
import { createInversionPool } from '../server/src/inversion-pool/inversion-pool';
import { invertNegativeFile } from '../server/src/inversion-pool/invert-negative-file';
import { BENCH_SETTINGS } from './bench-negative';

const [input, output] = process.argv.slice(2);
if (!input || !output) throw new Error('usage: invert-once <negative> <positive.jpg>');
sharp.cache(false);
const pool = createInversionPool();
await invertNegativeFile(pool, input, output, BENCH_SETTINGS);
await pool.close();
// maxRSS is in kilobytes (Node.js process.resourceUsage docs); worker threads are in the same process.
process.stdout.write(`${JSON.stringify({ peakRssMB: Math.round(process.resourceUsage().maxRSS / 1024) })}\n`);
