import type { TestRequest } from '@angular/common/http/testing';
import { TestBed } from '@angular/core/testing';
import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { MatButtonHarness } from '@angular/material/button/testing';
import { MatButtonToggleGroupHarness } from '@angular/material/button-toggle/testing';
import { MatDialogHarness } from '@angular/material/dialog/testing';
import { MatInputHarness } from '@angular/material/input/testing';
import { MatSelectHarness } from '@angular/material/select/testing';
import { MatSortHarness } from '@angular/material/sort/testing';
import { MatTableHarness } from '@angular/material/table/testing';
import type { Role, Stock } from '@clearbase/contracts';
import { CataloguePage } from './catalogue-page';
import { setUpListPage } from '../lists/set-up-list-page';
import { testStocks } from './catalogue-testing';

async function render(role: Role, stocks: Stock[] = testStocks) {
  const backend = setUpListPage(CataloguePage, { id: 1, email: `${role}@lab.test`, name: 'Test', role });
  const fixture = TestBed.createComponent(CataloguePage);
  await fixture.whenStable();
  backend.expectOne((r) => r.url === '/api/stocks').flush({ stocks });
  await fixture.whenStable();
  const page = TestbedHarnessEnvironment.loader(fixture);
  const root = TestbedHarnessEnvironment.documentRootLoader(fixture);
  const names = async () => {
    const table = await page.getHarness(MatTableHarness);
    const rows = await Promise.all((await table.getRows()).map((r) => r.getCellTextByColumnName()));
    return rows.map((r) => r['name']);
  };
  /** The next catalogue request, answered with the stocks given. */
  const answer = async (found: Stock[]): Promise<TestRequest> => {
    const req = backend.expectOne((r) => r.url === '/api/stocks');
    req.flush({ stocks: found });
    await fixture.whenStable();
    return req;
  };
  return { fixture, backend, page, root, names, answer };
}

describe('CataloguePage', () => {
  it('lists the stocks sorted by name', async () => {
    const { names } = await render('customer');
    expect(await names()).toEqual(['Bramble Mono 100', 'Glasswing 400', 'Kestrel Colour 160']);
  });

  it('sorts by ISO when that header is clicked', async () => {
    const { page, names } = await render('customer');
    const [iso] = await (await page.getHarness(MatSortHarness)).getSortHeaders({ label: 'ISO' });
    await iso!.click();
    expect(await names()).toEqual(['Bramble Mono 100', 'Kestrel Colour 160', 'Glasswing 400']);
  });

  it('asks the server for unmasked stocks only when that filter is chosen', async () => {
    const { page, answer, names } = await render('customer');
    const masking = await page.getHarness(MatButtonToggleGroupHarness);
    const [, unmasked] = await masking.getToggles();
    await unmasked!.check();
    const req = await answer(testStocks.filter((s) => !s.masked));
    expect(req.request.params.get('masked')).toBe('false');
    expect(await names()).toEqual(['Bramble Mono 100', 'Glasswing 400']);
  });

  it('sends the process filter and, after a pause in typing, the search', async () => {
    const { page, answer } = await render('customer');
    const process = await page.getHarness(
      MatSelectHarness.with({ selector: '[data-testid="catalogue-process"]' }),
    );
    await process.open();
    await process.clickOptions({ text: 'Black and white' });
    expect((await answer([testStocks[2]!])).request.params.get('process')).toBe('black-and-white');

    const search = await page.getHarness(
      MatInputHarness.with({ selector: '[data-testid="catalogue-search"]' }),
    );
    await search.setValue('corvel');
    await new Promise((r) => setTimeout(r, 350));
    const req = await answer([testStocks[2]!]);
    expect(req.request.params.get('q')).toBe('corvel');
    expect(req.request.params.get('process')).toBe('black-and-white');
  });

  it('says when nothing matches and clears the filters on request', async () => {
    const { page, answer, fixture } = await render('customer');
    const masking = await page.getHarness(MatButtonToggleGroupHarness);
    const [, , masked] = await masking.getToggles();
    await masked!.check();
    await answer([]);
    const empty = (fixture.nativeElement as HTMLElement).querySelector('[data-testid="catalogue-empty"]')!;
    expect(empty.textContent).toContain('No stock matches these filters.');
    await (await page.getHarness(MatButtonHarness.with({ text: 'Clear filters' }))).click();
    const req = await answer(testStocks);
    expect(req.request.params.keys()).toEqual([]);
  });

  it('offers a new stock to managers only', async () => {
    const { page } = await render('operator');
    expect(await page.getAllHarnesses(MatButtonHarness.with({ text: /New stock/ }))).toHaveLength(0);
  });

  it('validates the new stock form and shows the server’s complaint under the field it names', async () => {
    const { page, root, backend, fixture, answer } = await render('manager');
    await (await page.getHarness(MatButtonHarness.with({ text: /New stock/ }))).click();
    const dialog = await root.getHarness(MatDialogHarness);
    await (await dialog.getHarness(MatButtonHarness.with({ text: 'Add stock' }))).click();
    expect(await dialog.getText()).toContain('Required');
    backend.expectNone((r) => r.method === 'POST');

    const field = (id: string) =>
      dialog.getHarness(MatInputHarness.with({ selector: `[data-testid="${id}"]` }));
    await (await field('new-stock-name')).setValue('Glasswing 400');
    await (await field('new-stock-maker')).setValue('Harrowgate Emulsions');
    await (await field('new-stock-iso')).setValue('400');
    await (await field('new-stock-base')).setValue('tinted polyester');
    await (await field('new-stock-formats')).setValue('135-36, 120');
    await (await field('new-stock-exponent')).setValue('3');
    await (await dialog.getHarness(MatButtonHarness.with({ text: 'Add stock' }))).click();
    expect(await dialog.getText()).toContain('At most 2');
    backend.expectNone((r) => r.method === 'POST');

    await (await field('new-stock-exponent')).setValue('1.35');
    await (await dialog.getHarness(MatButtonHarness.with({ text: 'Add stock' }))).click();
    const post = backend.expectOne((r) => r.method === 'POST' && r.url === '/api/stocks');
    expect(post.request.body).toMatchObject({
      name: 'Glasswing 400',
      iso: 400,
      masked: false,
      frameFormats: ['135-36', '120'],
      reciprocityExponent: 1.35,
      recommendedEi: null,
    });
    post.flush(
      {
        type: 'about:blank',
        title: 'Conflict',
        status: 409,
        detail: 'A stock named Glasswing 400 already exists.',
        errors: [{ path: 'body.name', message: 'Another stock has this name' }],
      },
      { status: 409, statusText: 'Conflict' },
    );
    await fixture.whenStable();
    const shown = await dialog.getText();
    expect(shown).toContain('A stock named Glasswing 400 already exists.');
    const nameError = (fixture.nativeElement as HTMLElement).ownerDocument.querySelector(
      '[data-testid="new-stock-name-error"]',
    );
    expect(nameError?.textContent?.trim()).toBe('Another stock has this name');

    await (await field('new-stock-name')).setValue('Glasswing 800');
    await (await dialog.getHarness(MatButtonHarness.with({ text: 'Add stock' }))).click();
    backend
      .expectOne((r) => r.method === 'POST' && r.url === '/api/stocks')
      .flush(
        { stock: { ...testStocks[0], id: 9, name: 'Glasswing 800' } },
        { status: 201, statusText: 'Created' },
      );
    await fixture.whenStable();
    await answer([...testStocks, { ...testStocks[0]!, id: 9, name: 'Glasswing 800' }]);
    expect(await root.getAllHarnesses(MatDialogHarness)).toHaveLength(0);
  });
});
