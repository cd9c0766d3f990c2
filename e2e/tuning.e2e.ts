import { readdirSync, readFileSync, rmSync } from 'node:fs';
import { join } from 'node:path';
import { converter } from 'culori';
import sharp from 'sharp';
import { afterAll, describe, expect, it } from 'vitest';
import { D65_WHITE, linearSrgbToXyz, srgbDecode, xyzToLab } from '../libs/inversion/src/index';
import { useBrowserApp } from './support/browser-app';
import { fetchFromPage } from './support/fetch-from-page';
import { synthNegatives } from './support/synth-negatives';

// a roll-wide cast of 8 points towards magenta: plainly visible, common practice of the trade, from memory
const magentaCast = { cyanRed: 0, magentaGreen: -8, yellowBlue: 0 };

let scans: string;
let rollId: number;
let frameId: number;

const app = useBrowserApp({
  prepare() {
    // one 16-bit negative of grey steps on an 18 % grey surround, from the forward model
    scans = synthNegatives('clearbase-grey-', { frames: 2, width: 360, height: 240, scene: 'grey-steps' });
  },
});

afterAll(() => {
  if (scans) rmSync(scans, { recursive: true, force: true });
});

/** A JSON call from the signed-in page, with its CSRF token; answers status and body. */
const api = (method: string, path: string, body?: unknown) =>
  fetchFromPage(app.browser.page, method, path, body);

/** The frame's finished JPEG, fetched by the signed-in page. */
async function outputJpeg(id: number): Promise<Buffer> {
  const bytes = await app.browser.page.evaluate(async (id) => {
    // the output keeps its address when rendered again; skip the browser's cache
    const res = await fetch(`/api/frames/${id}/output?format=jpeg`, { cache: 'no-store' });
    return Array.from(new Uint8Array(await res.arrayBuffer()));
  }, id);
  return Buffer.from(bytes);
}

/** CIELAB (D65) of the mean sRGB of a rectangle given as fractions of the image. */
async function labOf(
  jpeg: Buffer,
  box: { x0: number; y0: number; x1: number; y1: number },
): Promise<number[]> {
  const { data, info } = await sharp(jpeg).removeAlpha().raw().toBuffer({ resolveWithObject: true });
  const sum = [0, 0, 0];
  let n = 0;
  for (let y = Math.floor(box.y0 * info.height); y < Math.floor(box.y1 * info.height); y++)
    for (let x = Math.floor(box.x0 * info.width); x < Math.floor(box.x1 * info.width); x++, n++)
      for (let c = 0; c < 3; c++) sum[c]! += data[(y * info.width + x) * 3 + c]!;
  const linear = sum.map((s) => srgbDecode(s / n / 255)) as [number, number, number];
  return xyzToLab(linearSrgbToXyz(linear), D65_WHITE);
}

const toLab65 = converter('lab65');

/** CIELAB (D65, culori's lab65) of the mean sRGB code values of a rectangle of RGB(A) pixels, fractions of the image. */
function meanLab65(
  data: ArrayLike<number>,
  size: { width: number; height: number; channels: number },
  box: { x0: number; y0: number; x1: number; y1: number },
): { l: number; a: number; b: number } {
  const sum = [0, 0, 0];
  let n = 0;
  for (let y = Math.floor(box.y0 * size.height); y < Math.floor(box.y1 * size.height); y++)
    for (let x = Math.floor(box.x0 * size.width); x < Math.floor(box.x1 * size.width); x++, n++)
      for (let c = 0; c < 3; c++) sum[c]! += data[(y * size.width + x) * size.channels + c]!;
  return lab65OfCodes(sum.map((s) => s / n));
}

/** CIELAB (D65, culori's lab65) of mean 8-bit sRGB code values. */
function lab65OfCodes([r, g, b]: number[]): { l: number; a: number; b: number } {
  const lab = toLab65({ mode: 'rgb', r: r! / 255, g: g! / 255, b: b! / 255 });
  return { l: lab.l, a: lab.a ?? 0, b: lab.b ?? 0 };
}

async function renderedAfter(since: string | null): Promise<void> {
  await expect
    .poll(
      async () => {
        const sheet = (await api('GET', `/api/rolls/${rollId}/tuning`)).body;
        const f = sheet.frames[0];
        return f.status === 'done' && f.renderedAt !== since;
      },
      { timeout: 60_000, interval: 500 },
    )
    .toBe(true);
}

// the middle of the frame: one grey step, well inside it
const patch = { x0: 0.47, y0: 0.4, x1: 0.53, y1: 0.6 };

describe('tuning a roll', () => {
  it('sets up a roll whose grey renders magenta', async () => {
    await app.signIn('customer@clearbase.test');
    const order = await api('POST', '/api/orders', { notes: 'Grey card test.', outputFormats: ['jpeg'] });
    expect(order.status).toBe(201);
    await app.signOut();

    await app.signIn('operator@clearbase.test');
    const { stocks } = (await api('GET', '/api/stocks')).body as { stocks: { id: number }[] };
    for (const stock of stocks) {
      const made = await api('POST', `/api/orders/${order.body.id}/rolls`, {
        stockId: stock.id,
        ei: 200,
        format: '135-36',
      });
      if (made.status === 201) {
        rollId = made.body.id;
        break;
      }
    }
    expect(rollId).toBeGreaterThan(0);
    const file = readdirSync(scans).sort()[0]!;
    const bytes = Array.from(readFileSync(join(scans, file)));
    const uploaded = await app.browser.page.evaluate(
      async ({ rollId, bytes, file }) => {
        const token = decodeURIComponent(/(?:^|; )XSRF-TOKEN=([^;]+)/.exec(document.cookie)?.[1] ?? '');
        const form = new FormData();
        form.append('files', new Blob([new Uint8Array(bytes)], { type: 'image/tiff' }), file);
        const res = await fetch(`/api/rolls/${rollId}/frames`, {
          method: 'POST',
          headers: { 'x-xsrf-token': token },
          body: form,
        });
        return (await res.json()) as { accepted: { frameId: number }[] };
      },
      { rollId, bytes, file },
    );
    frameId = uploaded.accepted[0]!.frameId;
    expect((await api('PUT', `/api/rolls/${rollId}/adjustments`, { balance: magentaCast })).status).toBe(200);
    expect((await api('POST', `/api/rolls/${rollId}/invert`, { frames: 'pending' })).status).toBe(202);
    await renderedAfter(null);
    const [, a] = await labOf(await outputJpeg(frameId), patch);
    // magenta: a* well above zero
    expect(a!).toBeGreaterThan(4);
  });

  it('lets an operator take the cast out with the neutral picker, save, and get a neutral grey', async () => {
    const { page } = app.browser;
    await page.goto(`${app.url}/rolls/${rollId}/tune`);
    const canvas = page.getByTestId('after-canvas');
    await expect
      .poll(() => canvas.evaluate((c) => (c as HTMLCanvasElement).width), { timeout: 30_000 })
      .toBeGreaterThan(0);
    // the canvas has a size before the first rendering: the picker needs the negative and its preview in
    await page.getByTestId('preview-ms').waitFor({ timeout: 30_000 });
    await page.getByText('Toggle', { exact: true }).click();
    await app.browser.screenshot('tuning-before-pick');

    await page.getByTestId('neutral-picker').click();
    const box = (await canvas.boundingBox())!;
    const at = (fx: number, fy: number) => [box.x + fx * box.width, box.y + fy * box.height] as const;
    await page.mouse.move(...at(0.48, 0.42));
    await page.mouse.down();
    await page.mouse.move(...at(0.5, 0.5), { steps: 4 });
    await page.mouse.move(...at(0.52, 0.58), { steps: 4 });
    await page.mouse.up();
    // the frame now carries the green the roll's cast took away (relative to red and blue)
    await expect
      .poll(async () => Number(await page.getByTestId('value-magentaGreen').innerText()))
      .not.toBe(0);
    const mg = Number(await page.getByTestId('value-magentaGreen').innerText());
    const cr = Number(await page.getByTestId('value-cyanRed').innerText());
    expect(Math.abs(mg - cr - 8)).toBeLessThanOrEqual(1);
    await app.browser.screenshot('tuning-picked');

    const since = (await api('GET', `/api/rolls/${rollId}/tuning`)).body.frames[0].renderedAt as string;
    await page.getByTestId('save').click();
    await renderedAfter(since);
    const [L, a, b] = await labOf(await outputJpeg(frameId), patch);
    expect(L!).toBeGreaterThan(10);
    expect(Math.abs(a!)).toBeLessThan(2);
    expect(Math.abs(b!)).toBeLessThan(2);
  });

  it('undoes and redoes a reset, and shows the keys on ?', async () => {
    const { page } = app.browser;
    const value = async () => Number(await page.getByTestId('value-magentaGreen').innerText());
    const picked = await value();
    expect(picked).not.toBe(0);
    await page.getByTestId('reset').click();
    await expect.poll(value).toBe(0);
    await page.keyboard.press('Control+z');
    await expect.poll(value).toBe(picked);
    await page.keyboard.press('Control+Shift+z');
    await expect.poll(value).toBe(0);
    await page.keyboard.press('Control+z');
    await expect.poll(value).toBe(picked);
    await page.keyboard.press('?');
    await page.getByRole('dialog', { name: 'Keyboard keys' }).waitFor();
    await page.keyboard.press('Escape');
    await expect.poll(() => page.getByRole('dialog', { name: 'Keyboard keys' }).count()).toBe(0);
  });

  it('approves the only frame, which approves the roll', async () => {
    const { page } = app.browser;
    await page.getByTestId('approve').click();
    await page.getByTestId('roll-approved').waitFor();
    expect(await page.getByTestId('review').innerText()).toContain('approved');
  });

  it('copies a frame’s tuning to a selected frame in one step, and undoes the copy', async () => {
    const { page } = app.browser;
    // the synth's second negative: a second frame of the roll
    const bytes = Array.from(readFileSync(join(scans, readdirSync(scans).sort()[1]!)));
    await page.evaluate(
      async ({ rollId, bytes }) => {
        const token = decodeURIComponent(/(?:^|; )XSRF-TOKEN=([^;]+)/.exec(document.cookie)?.[1] ?? '');
        const form = new FormData();
        form.append('files', new Blob([new Uint8Array(bytes)], { type: 'image/tiff' }), 'second.tif');
        await fetch(`/api/rolls/${rollId}/frames`, {
          method: 'POST',
          headers: { 'x-xsrf-token': token },
          body: form,
        });
      },
      { rollId, bytes },
    );
    await page.reload();
    await page.getByTestId('frame-2').waitFor();
    const carried = (index: number) => page.getByTestId(`carries-${index}`).innerText();
    expect(await carried(1)).toContain('MG +');
    expect(await carried(2)).toBe('');
    await page.getByRole('checkbox', { name: 'Select frame 2' }).check();
    await page.getByTestId('copy-to-selected').click();
    await expect.poll(() => carried(2)).toBe(await carried(1));
    await page.keyboard.press('Control+z');
    await expect.poll(() => carried(2)).toBe('');
    await page.keyboard.press('Control+Shift+z');
    await expect.poll(() => carried(2)).toBe(await carried(1));
  });

  it('lets an operator take the cast out with the magenta–green control, point by point, and get a neutral grey', async () => {
    const { page } = app.browser;
    // the frame starts over with no tuning of its own: its output carries the roll's magenta cast again
    expect((await api('PUT', `/api/frames/${frameId}/adjustments`, {})).status).toBe(200);
    let since = (await api('GET', `/api/rolls/${rollId}/tuning`)).body.frames[0].renderedAt as string;
    expect((await api('POST', `/api/rolls/${rollId}/invert`, { frames: 'pending' })).status).toBe(202);
    await renderedAfter(since);
    const castOutput = await sharp(await outputJpeg(frameId))
      .removeAlpha()
      .raw()
      .toBuffer({ resolveWithObject: true });
    const cast = meanLab65(castOutput.data, castOutput.info, patch);
    expect(cast.a).toBeGreaterThan(4);

    await page.goto(`${app.url}/rolls/${rollId}/tune`);
    const canvas = page.getByTestId('after-canvas');
    await expect
      .poll(() => canvas.evaluate((c) => (c as HTMLCanvasElement).width), { timeout: 30_000 })
      .toBeGreaterThan(0);
    const points = async () => Number(await page.getByTestId('value-magentaGreen').innerText());
    expect(await points()).toBe(0);
    /** The neutral patch as the live preview shows it: its mean code values, summed in the page. */
    const previewLab = async () => {
      const mean = await canvas.evaluate((c, box) => {
        const el = c as HTMLCanvasElement;
        const [x0, y0] = [Math.floor(box.x0 * el.width), Math.floor(box.y0 * el.height)];
        const [x1, y1] = [Math.floor(box.x1 * el.width), Math.floor(box.y1 * el.height)];
        const rgba = el.getContext('2d')!.getImageData(x0, y0, x1 - x0, y1 - y0).data;
        const sum = [0, 0, 0];
        for (let i = 0; i < rgba.length; i += 4) for (let k = 0; k < 3; k++) sum[k]! += rgba[i + k]!;
        return sum.map((v) => v / (rgba.length / 4));
      }, patch);
      return lab65OfCodes(mean);
    };
    // the canvas has its default size before the first rendering lands: wait until it has drawn one
    await expect
      .poll(async () => Number(await canvas.getAttribute('data-render-count')), { timeout: 30_000 })
      .toBeGreaterThan(0);
    let reading = await previewLab();
    expect(reading.l).toBeGreaterThan(10);
    expect(reading.a).toBeGreaterThan(4);

    // one whole point greener at a time (the slider's arrow key), until the patch's a* crosses zero in the preview
    const slider = page.getByTestId('cast-magentaGreen');
    await slider.focus();
    for (let step = 1; step <= 20; step++) {
      const previous = reading;
      await page.keyboard.press('ArrowRight');
      await expect.poll(points).toBe(step);
      await expect
        .poll(async () => {
          reading = await previewLab();
          return Math.abs(reading.a - previous.a) > 0.05;
        })
        .toBe(true);
      if (reading.a <= 0) {
        if (Math.abs(previous.a) < Math.abs(reading.a)) {
          await page.keyboard.press('ArrowLeft');
          await expect.poll(points).toBe(step - 1);
          const overshot = reading;
          await expect
            .poll(async () => {
              reading = await previewLab();
              return Math.abs(reading.a - overshot.a) > 0.05;
            })
            .toBe(true);
        }
        break;
      }
    }
    // the roll's cast was 8 points of magenta: the control takes out the same 8 points
    expect(Math.abs((await points()) - 8)).toBeLessThanOrEqual(1);
    await app.browser.screenshot('tuning-stepped');

    since = (await api('GET', `/api/rolls/${rollId}/tuning`)).body.frames[0].renderedAt as string;
    await page.getByTestId('save').click();
    await renderedAfter(since);
    const { data, info } = await sharp(await outputJpeg(frameId))
      .removeAlpha()
      .raw()
      .toBuffer({ resolveWithObject: true });
    const lab = meanLab65(data, info, patch);
    const fixed = (v: number) => v.toFixed(2);
    console.info(
      `magenta–green control: ${await points()} points; grey patch before a* ${fixed(cast.a)} b* ${fixed(cast.b)}, ` +
        `preview a* ${fixed(reading.a)}, saved output L* ${fixed(lab.l)} a* ${fixed(lab.a)} b* ${fixed(lab.b)}`,
    );
    expect(lab.l).toBeGreaterThan(10);
    expect(Math.abs(lab.a)).toBeLessThan(2);
    expect(Math.abs(lab.b)).toBeLessThan(2);
  });

  it('shows the saved full-size render at 1:1 under the pointer, and goes back to fit on Escape', async () => {
    const { page } = app.browser;
    // the page reads the sheet again while the frames render; 1:1 waits for the frame to be done
    const box = (await page.getByTestId('after-canvas').boundingBox())!;
    await page.mouse.move(box.x + box.width * 0.5, box.y + box.height * 0.5);
    await page.keyboard.press('1');
    const image = page.getByTestId('actual-pixels-image');
    await expect
      .poll(() => image.evaluate((img) => (img as HTMLImageElement).naturalWidth), { timeout: 30_000 })
      .toBe(360);
    const ratio = await page.evaluate(() => window.devicePixelRatio);
    const shown = (await image.boundingBox())!;
    // one image pixel per screen pixel
    expect(shown.width * ratio).toBeCloseTo(360, 0);
    expect(await page.getByTestId('actual-pixels-caption').innerText()).toContain('360×240');
    await app.browser.screenshot('tuning-actual-pixels');
    await page.keyboard.press('Escape');
    await expect.poll(() => page.getByTestId('actual-pixels-view').count()).toBe(0);
  });

  it('loads nothing from any other origin', () => {
    expect(app.browser.foreignRequests).toEqual([]);
  });
});
