import { describe, expect, it } from 'vitest';
import { useBrowserApp } from './support/browser-app';
import { fetchFromPage } from './support/fetch-from-page';

/** The parts of a version the test reads back. */
interface SavedVersion {
  status: string;
  changelog: string | null;
  parameters: { balance: { magentaGreen: number } };
}

const app = useBrowserApp();

/** The ids of the demo lab's open drafts, one per stock, read through the API as the signed-in user. */
async function demoDraftIds(): Promise<number[]> {
  return app.browser.page.evaluate(async () => {
    const { stocks } = (await (await fetch('/api/stocks')).json()) as { stocks: { id: number }[] };
    const ids: number[] = [];
    for (const stock of stocks) {
      const detail = (await (await fetch(`/api/stocks/${stock.id}`)).json()) as {
        profiles: { versions: { id: number; status: string }[] }[];
      };
      for (const profile of detail.profiles)
        for (const v of profile.versions) if (v.status === 'draft') ids.push(v.id);
    }
    return ids;
  });
}

/** A checksum of the edited preview's pixels, read from its canvas in the page. */
async function afterPixels(): Promise<number> {
  return app.browser.page.evaluate(() => {
    const canvas = document.querySelector<HTMLCanvasElement>('[data-testid="preview-after"]')!;
    const data = canvas.getContext('2d')!.getImageData(0, 0, canvas.width, canvas.height).data;
    let sum = 0;
    for (let i = 0; i < data.length; i += 4) sum += data[i]! * 3 + data[i + 1]! * 5 + data[i + 2]! * 7;
    return sum;
  });
}

/** Mean green minus mean red of the edited preview: goes up when the positive turns greener. */
async function afterGreenness(): Promise<number> {
  return app.browser.page.evaluate(() => {
    const canvas = document.querySelector<HTMLCanvasElement>('[data-testid="preview-after"]')!;
    const data = canvas.getContext('2d')!.getImageData(0, 0, canvas.width, canvas.height).data;
    let g = 0;
    for (let i = 0; i < data.length; i += 4) g += data[i + 1]! - data[i]!;
    return g / (data.length / 4);
  });
}

describe('the profile editor', () => {
  let draftIds: number[] = [];

  it('lets a manager change a draft’s magenta–green balance, see the preview change, save and publish it', async () => {
    const { page } = app.browser;
    await app.signIn('manager@clearbase.test');
    draftIds = await demoDraftIds();
    expect(draftIds.length).toBeGreaterThanOrEqual(3);
    const draftId = draftIds[0]!;

    await page.goto(`${app.url}/catalogue/versions/${draftId}`);
    await page.getByTestId('editor-status').filter({ hasText: 'Draft' }).waitFor();
    await page.getByTestId('preview-time').waitFor({ timeout: 60_000 });
    const firstTime = await page.getByTestId('preview-time').innerText();
    const before = await afterPixels();
    const greenBefore = await afterGreenness();
    expect(before).toBeGreaterThan(0);

    const field = page.getByTestId('balance-magentaGreen');
    const start = Number(await field.inputValue());
    await field.fill(String(start + 8));
    await page.waitForFunction(
      (old) => {
        const canvas = document.querySelector<HTMLCanvasElement>('[data-testid="preview-after"]')!;
        const data = canvas.getContext('2d')!.getImageData(0, 0, canvas.width, canvas.height).data;
        let sum = 0;
        for (let i = 0; i < data.length; i += 4) sum += data[i]! * 3 + data[i + 1]! * 5 + data[i + 2]! * 7;
        return sum !== old;
      },
      before,
      { timeout: 30_000 },
    );
    expect(await afterPixels()).not.toBe(before);
    // + on the magenta–green axis is more green in the positive
    expect(await afterGreenness()).toBeGreaterThan(greenBefore);
    const editedTime = await page.getByTestId('preview-time').innerText();
    // a few more steps on the same axis, each waited for, to log what a change costs once the worker is warm
    const stepTimes: string[] = [];
    for (const step of [9, 10, 8]) {
      // the canvas counts its renderings: two of them may well take the same whole milliseconds
      const drawn = Number(await page.getByTestId('preview-after').getAttribute('data-render-count'));
      await field.fill(String(start + step));
      await page.waitForFunction(
        (seen) =>
          Number(document.querySelector('[data-testid="preview-after"]')?.getAttribute('data-render-count')) >
          seen,
        drawn,
        { timeout: 30_000 },
      );
      stepTimes.push(await page.getByTestId('preview-time').innerText());
    }
    console.log(
      `preview render, 1.5 MP: first: ${firstTime}\nafter a balance change: ${editedTime}\n${stepTimes.join('\n')}`,
    );
    await app.browser.screenshot('profile-editor-edited');

    await page.getByTestId('editor-save').click();
    await page.getByTestId('editor-publish').and(page.locator(':enabled')).waitFor();
    await page.getByTestId('changes').filter({ hasText: 'balance.magentaGreen' }).waitFor();
    const saved = await page.evaluate(
      async (id) =>
        ((await (await fetch(`/api/profile-versions/${id}`)).json()) as { version: SavedVersion }).version,
      draftId,
    );
    expect(saved.parameters.balance.magentaGreen).toBe(start + 8);

    await page.getByTestId('editor-publish').click();
    await page.getByTestId('publish-submit').click();
    await page.getByText('Say in one line what changed.').waitFor();
    await page.getByTestId('publish-changelog').fill('Two points more green after the trial roll');
    await page.getByTestId('publish-submit').click();
    await page.getByTestId('editor-status').filter({ hasText: 'Published' }).waitFor();
    await page.getByTestId('editor-read-only').waitFor();
    const published = await page.evaluate(
      async (id) =>
        ((await (await fetch(`/api/profile-versions/${id}`)).json()) as { version: SavedVersion }).version,
      draftId,
    );
    expect(published).toMatchObject({
      status: 'published',
      changelog: 'Two points more green after the trial roll',
    });
    await app.browser.screenshot('profile-editor-published');
    await app.signOut();
  });

  it('shows an operator no publish button, and the API answers the operator’s publish with 403', async () => {
    const { page } = app.browser;
    await app.signIn('operator@clearbase.test');
    const draftId = draftIds[1]!;
    await page.goto(`${app.url}/catalogue/versions/${draftId}`);
    await page.getByTestId('editor-status').filter({ hasText: 'Draft' }).waitFor();
    await page.getByTestId('editor-save').waitFor();
    expect(await page.getByTestId('editor-publish').count()).toBe(0);
    const status = await fetchFromPage(page, 'POST', `/api/profile-versions/${draftId}/publish`, {
      changelog: 'An operator tries to publish',
    });
    expect(status.status).toBe(403);
    expect(status.type).toMatch(/^application\/problem\+json/);
    await app.signOut();
  });

  it('loads nothing from any other origin', () => {
    expect(app.browser.foreignRequests).toEqual([]);
  });
});
