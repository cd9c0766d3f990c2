import { describe, expect, it } from 'vitest';
import { useBrowserApp } from './support/browser-app';

const app = useBrowserApp();

/** The stock names the catalogue table shows, once it shows exactly `count` rows. */
async function stockNames(count: number): Promise<string[]> {
  const rows = app.browser.page.locator('[data-testid^="stock-row-"]');
  await expect.poll(() => rows.count(), { timeout: 10_000 }).toBe(count);
  return app.browser.page.locator('[data-testid^="stock-link-"]').allInnerTexts();
}

describe('the film stock catalogue', () => {
  it('lets a customer filter to unmasked stocks, open one and work out a long exposure', async () => {
    const { page } = app.browser;
    await app.signIn('customer@clearbase.test');
    await page.getByTestId('nav-catalogue').click();
    await page.getByTestId('catalogue-table').waitFor();
    expect((await stockNames(3)).sort()).toEqual(['Glasswing 400', 'Kestrel Colour 160', 'Tealine 200']);

    await page.getByTestId('masking-unmasked').click();
    expect(await stockNames(2)).toEqual(['Glasswing 400', 'Tealine 200']);
    await app.browser.screenshot('catalogue-unmasked');

    await page.locator('[data-testid^="stock-link-"]', { hasText: 'Glasswing 400' }).click();
    await page.getByTestId('stock-sheet').waitFor();
    expect(await page.getByTestId('stock-name').innerText()).toBe('Glasswing 400');
    expect(await page.getByTestId('sheet-exponent').innerText()).toBe('p = 1.3');
    await page.getByTestId('reciprocity-metered').fill('10');
    // t_c = t_m^p with p = 1.3: 10 s ⇒ 19.95 s (practical form of Schwarzschild's law, common practice of the trade)
    await expect.poll(() => page.getByTestId('reciprocity-corrected').innerText()).toBe('19.95 s');
    expect(await page.locator('[data-testid^="timeline-"]').count()).toBe(0);
    await app.browser.screenshot('stock-sheet-customer');
    await app.signOut();
  });

  it('lets an operator make a new draft from a published version, and offers no retiring', async () => {
    const { page } = app.browser;
    await app.signIn('operator@clearbase.test');
    await page.getByTestId('nav-catalogue').click();
    await page.locator('[data-testid^="stock-link-"]', { hasText: 'Tealine 200' }).click();
    const timeline = page.locator('[data-testid^="timeline-"]').first();
    await timeline.waitFor();
    const entries = timeline.locator('li[data-testid^="version-"]');
    const before = await entries.count();
    const drafts = timeline.locator('li[data-status="draft"]');
    const draftsBefore = await drafts.count();

    const published = timeline.locator('li[data-status="published"]').first();
    await published.locator('[data-testid^="new-draft-"]').click();
    await expect.poll(() => entries.count(), { timeout: 10_000 }).toBe(before + 1);
    expect(await drafts.count()).toBe(draftsBefore + 1);
    // newest first: the new draft heads the timeline, made from the published version
    const newest = entries.first();
    expect(await newest.getAttribute('data-status')).toBe('draft');
    const publishedNumber = (await published.locator('.number').innerText()).replace('Version ', '');
    expect(await newest.innerText()).toContain(`from version ${publishedNumber}`);
    expect(await newest.locator('[data-testid^="edit-draft-"]').count()).toBe(1);

    expect(await page.locator('[data-testid^="retire-"]').count()).toBe(0);
    await app.browser.screenshot('stock-page-operator');
    await app.signOut();
  });

  it('loads nothing from any other origin', () => {
    expect(app.browser.foreignRequests).toEqual([]);
  });
});
