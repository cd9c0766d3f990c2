import { rmSync, readdirSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { useBrowserApp } from './support/browser-app';
import { fetchFromPage } from './support/fetch-from-page';
import { synthNegatives } from './support/synth-negatives';

let scans: string;
let orderId: number;
let rollUrl: string;
let good: string[];

const app = useBrowserApp({
  prepare() {
    // two good 16-bit negatives from the forward model, and a text file that only calls itself a TIFF
    scans = synthNegatives('clearbase-scans-', { frames: 2, width: 240, height: 160 });
    good = readdirSync(scans).sort();
    writeFileSync(join(scans, 'contact-notes.tif'), 'Frames 1 and 2 from the harbour walk.\n');
  },
});

afterAll(() => {
  if (scans) rmSync(scans, { recursive: true, force: true });
});

describe('a roll from order to positives', () => {
  it('lets a customer place an order', async () => {
    await app.signIn('customer@clearbase.test');
    // placed through the API from the signed-in page, with the session's CSRF token
    const order = (
      await fetchFromPage(app.browser.page, 'POST', '/api/orders', {
        notes: 'Harbour walk, one roll.',
        outputFormats: ['jpeg'],
      })
    ).body as { id: number };
    orderId = order.id;
    expect(orderId).toBeGreaterThan(0);
    await app.signOut();
  });

  it('lets an operator add a roll, upload three files, and watch two frames invert live', async () => {
    const { page } = app.browser;
    await app.signIn('operator@clearbase.test');
    await page.getByTestId('nav-orders').click();
    await page.getByTestId(`order-link-${orderId}`).click();
    await page.getByTestId('order-title').waitFor();
    expect(await page.getByTestId('order-notes').innerText()).toBe('Harbour walk, one roll.');

    await page.getByTestId('add-roll').click();
    await page.getByTestId('add-roll-stock').click();
    await page.getByRole('option', { name: /Tealine 200/ }).click();
    await page.getByTestId('add-roll-ei').fill('400');
    await page.getByTestId('add-roll-format').fill('135-36');
    await page.getByTestId('add-roll-push-pull').click();
    await page.getByRole('option', { name: '+1 stop push' }).click();
    await page.getByTestId('add-roll-submit').click();
    const rollLink = page.locator('[data-testid^="roll-link-"]');
    await rollLink.waitFor();
    const row = page.locator('[data-testid^="roll-row-"]');
    expect(await row.innerText()).toContain('+1 stop push');
    await app.browser.screenshot('order-page-operator');

    await rollLink.click();
    await page.getByTestId('roll-title').waitFor();
    rollUrl = page.url();
    expect(await page.getByTestId('roll-title').innerText()).toContain('Tealine 200');
    // the page must not reload from here on: the frames turn done through the live stream
    await page.evaluate(() => ((window as unknown as { stayed: boolean }).stayed = true));

    const chooser = page.waitForEvent('filechooser');
    await page.getByTestId('upload-pick').click();
    await (
      await chooser
    ).setFiles([join(scans, good[0]!), join(scans, 'contact-notes.tif'), join(scans, good[1]!)]);

    const line = (name: string) => page.locator('li[data-testid^="upload-"]', { hasText: name });
    await expect.poll(() => line(good[1]!).getAttribute('data-state'), { timeout: 30_000 }).toBe('accepted');
    await expect.poll(() => line(good[0]!).getAttribute('data-state')).toBe('accepted');
    await expect.poll(() => line('contact-notes.tif').getAttribute('data-state')).toBe('rejected');
    expect(await line('contact-notes.tif').getByTestId('upload-reason').innerText()).toBe(
      'The file is not an image: it does not start like a TIFF, PNG or JPEG file.',
    );
    expect(await line(good[0]!).getByTestId('upload-reason').count()).toBe(0);
    await expect.poll(() => page.getByTestId('upload-batch-counts').innerText()).toBe('2 kept · 1 refused');
    await page.getByTestId('frame-2').waitFor();
    await app.browser.screenshot('roll-page-uploaded');

    await page.getByTestId('invert-roll').click();
    const status = (index: number) => page.getByTestId(`frame-${index}`).getByTestId('frame-status');
    await expect.poll(() => status(1).innerText(), { timeout: 60_000 }).toBe('Done');
    await expect.poll(() => status(2).innerText(), { timeout: 60_000 }).toBe('Done');
    await expect.poll(() => page.getByTestId('job-state').innerText(), { timeout: 20_000 }).toBe('Finished');
    await expect.poll(() => page.getByTestId('job-progress').innerText()).toContain('2 of 2 done');
    expect(await page.evaluate(() => (window as unknown as { stayed?: boolean }).stayed)).toBe(true);
    // the thumbnails are the positives now, and they load
    const thumb = page.getByTestId('frame-1').locator('img');
    await expect.poll(() => thumb.getAttribute('src')).toMatch(/\/preview\?/);
    await expect
      .poll(() => thumb.evaluate((img) => (img as HTMLImageElement).naturalWidth), { timeout: 20_000 })
      .toBeGreaterThan(0);
    await app.browser.screenshot('roll-page-inverted');
    await app.signOut();
  });

  it('keeps a customer off the roll page, even of their own order', async () => {
    const { page } = app.browser;
    await app.signIn('customer@clearbase.test');
    await page.goto(rollUrl);
    await page.getByTestId('home-greeting').waitFor();
    expect(new URL(page.url()).pathname).toBe('/');
    expect(await page.getByTestId('roll-title').count()).toBe(0);
    // and the order page shows the roll without a link to it
    await page.goto(`${app.url}/orders/${orderId}`);
    await page.locator('[data-testid^="roll-row-"]').waitFor();
    expect(await page.locator('[data-testid^="roll-link-"]').count()).toBe(0);
  });

  it('loads nothing from any other origin', () => {
    expect(app.browser.foreignRequests).toEqual([]);
  });
});
