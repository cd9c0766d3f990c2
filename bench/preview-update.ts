// The tuning screen's live preview, timed in the browser: `npm run build:web && npx tsx bench/preview-update.ts
// [--moves N]`. Starts the real server (demo lab, temporary data folder) and the system Chromium, opens a roll whose
// frame is a 1500 × 1000 (1.5 MP) negative from the forward model, moves the magenta–green control N times and
// prints the median time from the move to the drawn preview, and the worker's own time, next to the engine's Node
// figure (compile + apply at 8 bits) for the same negative and the same change.
import { execFileSync } from 'node:child_process';
import { mkdtempSync, readdirSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { performance } from 'node:perf_hooks';
import { parseArgs } from 'node:util';
import {
  applyInversion,
  compileInversion,
  detectFilmBase,
  LINEAR_SCANNER,
  measureFrameLevels,
  neutralBalance,
  POLYCLEAR_200,
  profileForStock,
} from '../libs/inversion/src/index';
import { readNegative } from '../server/src/imaging/index';
import { openBrowser } from '../e2e/support/browser-session';
import { startTestServer } from '../e2e/support/test-server';

const { values } = parseArgs({ options: { moves: { type: 'string', default: '21' } } });
const moves = Number(values.moves);
// 1500 × 1000 = 1.5 MP, the working negative's size at 3:2
const [width, height] = [1500, 1000];
const demoPassword = 'clearbase-demo';
const median = (xs: number[]) => [...xs].sort((a, b) => a - b)[Math.floor(xs.length / 2)]!;

const scans = mkdtempSync(join(tmpdir(), 'clearbase-bench-preview-'));
execFileSync(
  process.execPath,
  [
    'bin/clearbase.mjs',
    'synth',
    '--out',
    scans,
    '--frames',
    '1',
    '--width',
    String(width),
    '--height',
    String(height),
  ],
  { stdio: 'ignore' },
);
const file = join(scans, readdirSync(scans)[0]!);

// --- Node: the engine on the same negative, one balance change per round
const negative = await readNegative(file, {});
const profile = profileForStock(POLYCLEAR_200);
const base = detectFilmBase(negative, LINEAR_SCANNER);
const levels = measureFrameLevels(
  { profile, scanner: LINEAR_SCANNER, base: base.rgb, render: 'print', outputBits: 8 },
  negative,
);
const out = new Uint8Array(negative.data.length);
const nodeTimes: number[] = [];
for (let i = 0; i < moves; i++) {
  const start = performance.now();
  const plan = compileInversion({
    profile,
    scanner: LINEAR_SCANNER,
    base: base.rgb,
    balances: [neutralBalance(levels), { cyanRed: 0, magentaGreen: (i % 10) - 5, yellowBlue: 0 }],
    midLogExposure: levels.midLogExposure,
    render: 'print',
    outputBits: 8,
  });
  applyInversion(plan, negative.data, out, 0, negative.width * negative.height);
  nodeTimes.push(performance.now() - start);
}

// --- the browser: the tuning screen of a roll holding that negative
const server = await startTestServer();
const browser = await openBrowser(server.url);
const { page } = browser;
try {
  const signIn = async (role: string) => {
    await page.goto(`${server.url}/sign-in`);
    await page.getByTestId('sign-in-email').fill(`${role}@clearbase.test`);
    await page.getByTestId('sign-in-password').fill(demoPassword);
    await page.getByTestId('sign-in-submit').click();
    await page.getByTestId('home-greeting').waitFor();
  };
  const call = (method: string, path: string, body?: unknown) =>
    page.evaluate(
      async ({ method, path, body }) => {
        const token = decodeURIComponent(/(?:^|; )XSRF-TOKEN=([^;]+)/.exec(document.cookie)?.[1] ?? '');
        const res = await fetch(path, {
          method,
          headers: { 'content-type': 'application/json', 'x-xsrf-token': token },
          ...(body === undefined ? {} : { body: JSON.stringify(body) }),
        });
        return { status: res.status, body: (await res.json()) as Record<string, unknown> };
      },
      { method, path, body },
    );
  await signIn('customer');
  const order = (await call('POST', '/api/orders', { outputFormats: ['jpeg'] })).body['id'] as number;
  await page.getByTestId('user-menu').click();
  await page.getByTestId('sign-out').click();
  await page.getByTestId('sign-in-email').waitFor();
  await signIn('operator');
  const { stocks } = (await call('GET', '/api/stocks')).body as { stocks: { id: number }[] };
  let rollId = 0;
  for (const s of stocks) {
    const made = await call('POST', `/api/orders/${order}/rolls`, {
      stockId: s.id,
      ei: 200,
      format: '135-36',
    });
    if (made.status === 201) {
      rollId = made.body['id'] as number;
      break;
    }
  }
  const bytes = Array.from(readFileSync(file));
  await page.evaluate(
    async ({ rollId, bytes }) => {
      const token = decodeURIComponent(/(?:^|; )XSRF-TOKEN=([^;]+)/.exec(document.cookie)?.[1] ?? '');
      const form = new FormData();
      form.append('files', new Blob([new Uint8Array(bytes)], { type: 'image/tiff' }), 'bench.tif');
      await fetch(`/api/rolls/${rollId}/frames`, {
        method: 'POST',
        headers: { 'x-xsrf-token': token },
        body: form,
      });
    },
    { rollId, bytes },
  );
  await page.goto(`${server.url}/rolls/${rollId}/tune`);
  // the first rendering of the edited side is drawn: the canvas counts what it has drawn
  await page.waitForFunction(
    () =>
      Number(document.querySelector('[data-testid="after-canvas"]')?.getAttribute('data-render-count')) > 0,
    undefined,
    { timeout: 60_000 },
  );

  const browserTimes: number[] = [];
  const workerTimes: number[] = [];
  for (let i = 0; i < moves; i++) {
    const measured = await page.evaluate(
      async ({ value, move }) => {
        const input = document.querySelector<HTMLInputElement>('[data-testid="cast-magentaGreen"]')!;
        const canvas = document.querySelector<HTMLCanvasElement>('[data-testid="after-canvas"]')!;
        const label = document.querySelector('[data-testid="preview-ms"]')!;
        // read inline, not through a local function: tsx would wrap a named one in a helper the page lacks
        const seen = Number(canvas.dataset['renderCount'] ?? 0);
        // the next rendering is the next count, even when it took the same whole milliseconds as the last
        const drawn = new Promise<void>((resolve, reject) => {
          const watch = new MutationObserver(() => {
            if (Number(canvas.dataset['renderCount'] ?? 0) <= seen) return;
            watch.disconnect();
            clearTimeout(stuck);
            resolve();
          });
          // a bound on a wait for state: a preview that never comes says so instead of hanging the run
          const stuck = setTimeout(() => {
            watch.disconnect();
            reject(new Error(`move ${move}: no new preview drawn within 60 s (still ${seen} drawn)`));
          }, 60_000);
          watch.observe(canvas, { attributes: true, attributeFilter: ['data-render-count'] });
        });
        const start = performance.now();
        input.value = String(value);
        input.dispatchEvent(new Event('input', { bubbles: true }));
        await drawn;
        // the timing label is written in the same pass; after the next frame it is on screen too
        await new Promise((r) => requestAnimationFrame(() => r(null)));
        return {
          total: performance.now() - start,
          worker: Number(/(\d+)/.exec(label.textContent ?? '')?.[1]),
        };
      },
      { value: ((i % 2) * 2 - 1) * (1 + (i % 7)), move: i + 1 },
    );
    browserTimes.push(measured.total);
    workerTimes.push(measured.worker);
  }
  console.log(
    `Preview update, ${width} × ${height} (${((width * height) / 1e6).toFixed(1)} MP), median of ${moves} moves:`,
  );
  console.log(`  browser, control moved → preview drawn: ${median(browserTimes).toFixed(1)} ms`);
  console.log(`  browser, in the worker (tables + pixels): ${median(workerTimes).toFixed(0)} ms`);
  console.log(`  Node, compileInversion + applyInversion at 8 bits: ${median(nodeTimes).toFixed(1)} ms`);
} finally {
  await browser.close();
  await server.stop();
  rmSync(scans, { recursive: true, force: true });
}
