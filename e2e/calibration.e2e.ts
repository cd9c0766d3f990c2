import { calibrationRoll, LINEAR_SCANNER, TINTLINE_400, type FilmStock } from '../libs/inversion/src/index';
import { mkdtemp, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import sharp from 'sharp';
import { afterAll, describe, expect, it } from 'vitest';
import { demoCalibrationFrame, demoCalibrationLayout } from '../server/src/demo/demo-calibration-layout';
import { useBrowserApp } from './support/browser-app';

// An invented stock whose curves bend inside the bracket, with a tinted base and crosstalk.
const STOCK: FilmStock = {
  ...TINTLINE_400,
  name: 'Browser test 400',
  gamma: [0.55, 0.62, 0.7],
  toe: [-2.1, -2.05, -2.0],
  maxDensity: [2.0, 2.1, 2.2],
  softness: 0.2,
};

let dir: string;
let roll: ReturnType<typeof calibrationRoll>;
let greyPaths: string[];
let chartPath: string;

/** 16-bit TIFF as a scanner writes it (sharp's TIFF default is JPEG compression, 8-bit: deflate keeps 16 bits). */
function writeTiff(path: string, data: Uint16Array, width: number, height: number) {
  return sharp(data, { raw: { width, height, channels: 3 } })
    .toColourspace('rgb16')
    .tiff({ compression: 'deflate', predictor: 'horizontal' })
    .toFile(path);
}

const app = useBrowserApp({
  async prepare() {
    dir = await mkdtemp(join(tmpdir(), 'clearbase-calibration-e2e-'));
    roll = calibrationRoll({
      stock: STOCK,
      scanner: LINEAR_SCANNER,
      stops: Array.from({ length: 15 }, (_, i) => i - 6),
      greySize: 48,
      patchSize: 40,
    });
    greyPaths = roll.brackets.map((_, i) => join(dir, `grey-${String(i + 1).padStart(2, '0')}.tif`));
    await Promise.all(
      roll.brackets.map((b, i) =>
        writeTiff(greyPaths[i]!, b.negative.data, b.negative.width, b.negative.height),
      ),
    );
    chartPath = join(dir, 'chart.tif');
    await writeTiff(chartPath, roll.chart.data, roll.chart.width, roll.chart.height);
  },
});

afterAll(async () => {
  if (dir) await rm(dir, { recursive: true, force: true });
});

/** Where a point of the frame (full-size pixels) is on screen inside a marker's SVG, kept half a pixel inside it. */
async function onScreen(testId: string, [x, y]: readonly number[], frame: { width: number; height: number }) {
  await app.browser.page.getByTestId(testId).scrollIntoViewIfNeeded();
  const box = (await app.browser.page.getByTestId(testId).boundingBox())!;
  const fx = Math.min(frame.width - 0.5, Math.max(0.5, x!));
  const fy = Math.min(frame.height - 0.5, Math.max(0.5, y!));
  return { x: box.x + (fx / frame.width) * box.width, y: box.y + (fy / frame.height) * box.height };
}

/** Signs in afresh as a demo account. */
async function signIn(email: string) {
  await app.browser.context.clearCookies();
  await app.signIn(email);
}

describe('calibration', () => {
  it('an operator uploads a calibration roll, marks the chart by clicking its corners and sees the report with its draft', async () => {
    const { page } = app.browser;
    await signIn('operator@clearbase.test');

    await page.getByTestId('nav-calibration').click();
    // the stocks arrive after the page: open the list once it has them
    await expect
      .poll(async () => Number(await page.getByTestId('calibration-stock').getAttribute('data-options')))
      .toBeGreaterThan(0);
    // the field's floating label lies over the empty select: the click reaches the field, which opens it
    await page.getByTestId('calibration-stock').click({ force: true });
    await page.getByRole('option').first().click();

    await page.getByTestId('grey-files').setInputFiles(greyPaths);
    await page.getByTestId('bracket-table').waitFor();
    for (const [i, b] of roll.brackets.entries()) await page.getByTestId(`stops-${i}`).fill(String(b.stops));

    // the grey rectangle: dragged over the grey card of the first frame
    const grey = roll.brackets[0]!.negative;
    await page.getByTestId('grey-marker').waitFor();
    const [gx, gy, gw, gh] = roll.greyRegion;
    const from = await onScreen('grey-marker', [gx, gy], grey);
    const to = await onScreen('grey-marker', [gx + gw, gy + gh], grey);
    await page.mouse.move(from.x, from.y);
    await page.mouse.down();
    await page.mouse.move(to.x, to.y, { steps: 5 });
    await page.mouse.up();
    // the page proposes a rectangle of its own first: wait for the one dragged, to a frame pixel (edges round outwards)
    const dragged = [gx, gy, gw, gh];
    await expect
      .poll(async () => {
        const shown = ((await page.getByTestId('grey-region').textContent())?.match(/\d+/g) ?? []).map(
          Number,
        );
        return shown.length === 4 ? Math.max(...shown.map((v, i) => Math.abs(v - dragged[i]!))) : Infinity;
      })
      .toBeLessThanOrEqual(1);

    await page.getByTestId('chart-file').setInputFiles(chartPath);
    await page.getByTestId('chart-marker').waitFor();
    // each click is placed on the marker when it is clicked, after it has stopped moving (previews load in any order)
    const chartMarker = page.getByTestId('chart-marker');
    await chartMarker.scrollIntoViewIfNeeded();
    const chartBox = (await chartMarker.boundingBox())!;
    for (const [x, y] of roll.chartCorners) {
      const fx = Math.min(roll.chart.width - 0.5, Math.max(0.5, x!));
      const fy = Math.min(roll.chart.height - 0.5, Math.max(0.5, y!));
      await chartMarker.click({
        position: {
          x: (fx / roll.chart.width) * chartBox.width,
          y: (fy / roll.chart.height) * chartBox.height,
        },
      });
    }
    await expect.poll(() => page.getByTestId('sample-area').count()).toBe(24);
    await page.getByTestId('corner-hint').filter({ hasText: 'All four corners set' }).waitFor();

    await page.getByTestId('calibration-submit').click();
    // the fit runs on the server: on a busy machine it takes a good part of a minute
    await page.getByTestId('report-title').waitFor({ timeout: 60_000 });

    for (const [c, channel] of (['red', 'green', 'blue'] as const).entries()) {
      const gamma = Number(await page.getByTestId(`gamma-${channel}`).textContent());
      // γ of the forward model's stock within 3 %
      expect(Math.abs(gamma / STOCK.gamma[c]! - 1)).toBeLessThan(0.03);
    }
    expect(await page.getByTestId('ei').textContent()).toMatch(/EI \d+/);
    expect(await page.getByTestId('delta-e-row').count()).toBe(24);
    expect(await page.getByTestId('swatch-reference').count()).toBe(24);

    const href = await page.getByTestId('draft-link').getAttribute('href');
    expect(href).toMatch(/^\/catalogue\/versions\/\d+$/);
    const versionId = Number(href!.split('/').pop());
    const status = await page.evaluate(async (id) => {
      const res = await fetch(`/api/profile-versions/${id}`);
      return ((await res.json()) as { version: { status: string } }).version.status;
    }, versionId);
    expect(status).toBe('draft');
    expect(await page.getByTestId('pdf-link').getAttribute('href')).toMatch(/\/report\.pdf$/);
  });

  it('an operator loads the demo lab’s roll on file, keeps the grey rectangle, marks the chart, fits it and edits the draft', async () => {
    const { page } = app.browser;
    await signIn('operator@clearbase.test');
    await page.getByTestId('nav-calibration').click();
    await page.getByTestId('rolls-on-file').getByText('Tealine 200').waitFor();
    await page.getByTestId('load-roll-1').click();

    // the bracket comes with its stops; the grey rectangle the page proposes (the first frame's central half) is kept
    await page.getByTestId('bracket-table').waitFor();
    const stops = await page
      .locator('[data-testid^="stops-"]')
      .evaluateAll((inputs) => inputs.map((i) => Number((i as HTMLInputElement).value)));
    expect(stops).toEqual([-3, -2, -1, 0, 1, 2, 3, 4]);
    await page.getByTestId('grey-marker').waitFor();
    // the proposed rectangle lies on the grey card, clear of the rebates above and below it
    const proposed = (await page.getByTestId('grey-region').textContent())!.match(/\d+/g)!.map(Number);
    const [, gy, , gh] = proposed;
    const { rebate, height } = demoCalibrationFrame;
    expect(gy).toBeGreaterThanOrEqual(rebate);
    expect(gy! + gh!).toBeLessThanOrEqual(height - rebate);
    await page.getByText('leader.tif').waitFor();

    await page.getByTestId('chart-marker').waitFor();
    // each click is placed on the marker when it is clicked, after it has stopped moving (previews load in any order)
    const marker = page.getByTestId('chart-marker');
    const size = (await marker.boundingBox())!;
    const { chart } = demoCalibrationLayout;
    for (const [x, y] of demoCalibrationLayout.chartCorners) {
      const fx = Math.min(chart.width - 0.5, Math.max(0.5, x));
      const fy = Math.min(chart.height - 0.5, Math.max(0.5, y));
      await marker.click({
        position: { x: (fx / chart.width) * size.width, y: (fy / chart.height) * size.height },
      });
    }
    await app.browser.screenshot('calibration-demo-roll-marked');
    await expect.poll(() => page.getByTestId('sample-area').count()).toBe(24);
    await page.getByTestId('corner-hint').filter({ hasText: 'All four corners set' }).waitFor();
    await page.getByTestId('calibration-submit').click();
    await page.getByTestId('report-title').filter({ hasText: 'Tealine 200' }).waitFor({ timeout: 60_000 });

    // three curves, the ΔE00 table and the warnings
    for (const channel of ['red', 'green', 'blue']) await page.getByTestId(`curve-${channel}`).waitFor();
    expect(await page.getByTestId('delta-e-row').count()).toBe(24);
    expect(await page.getByTestId('calibration-warnings').locator('li').count()).toBeGreaterThan(0);
    expect(await page.getByTestId('calibration-warnings').textContent()).toMatch(/speed point/i);
    await app.browser.screenshot('calibration-report-demo-roll');

    const calibrationId = Number(page.url().split('/').pop());

    // the draft was saved with the fit: it opens in the profile editor, where a change is saved to it
    await page.getByTestId('draft-link').click();
    await page.getByTestId('editor-status').filter({ hasText: 'Draft' }).waitFor();
    expect(await page.getByTestId('editor-title').textContent()).toContain('Tealine 200');
    const draftId = Number(page.url().split('/').pop());
    const saturationOf = () =>
      page.evaluate(async (id) => {
        const res = await fetch(`/api/profile-versions/${id}`);
        const body = (await res.json()) as {
          version: { status: string; parameters: { saturation: number } };
        };
        return body.version;
      }, draftId);
    const start = (await saturationOf()).parameters.saturation;
    const wanted = Math.round((start + 0.05) * 100) / 100;
    await page.getByTestId('saturation').fill(String(wanted));
    await page.getByTestId('editor-save').click();
    await expect
      .poll(async () => (await saturationOf()).parameters.saturation, { timeout: 30_000 })
      .toBeCloseTo(wanted, 9);
    expect((await saturationOf()).status).toBe('draft');

    // the stock page offers a calibration of the stock and links the draft back to its calibration report
    const stockId = await page.evaluate(async (id) => {
      const res = await fetch(`/api/calibrations/${id}`);
      return ((await res.json()) as { stockId: number }).stockId;
    }, calibrationId);
    await page.goto(`${app.url}/catalogue/stocks/${stockId}`);
    expect(await page.getByTestId('calibrate-stock').getAttribute('href')).toBe(
      `/calibration?stock=${stockId}`,
    );
    await page.getByTestId(`calibration-report-${draftId}`).click();
    await page
      .getByTestId('report-title')
      .filter({ hasText: `Calibration ${calibrationId}` })
      .waitFor();
    await page.getByTestId('stock-link').click();
    await page.getByTestId('stock-name').filter({ hasText: 'Tealine 200' }).waitFor();
  });
});
