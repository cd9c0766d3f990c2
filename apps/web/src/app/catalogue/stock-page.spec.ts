import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { provideZonelessChangeDetection } from '@angular/core';
import { TestBed } from '@angular/core/testing';
import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { MATERIAL_ANIMATIONS } from '@angular/material/core';
import { MatButtonHarness } from '@angular/material/button/testing';
import { MatDialogHarness } from '@angular/material/dialog/testing';
import { MatInputHarness } from '@angular/material/input/testing';
import { provideRouter } from '@angular/router';
import type { Role, StockDetail, User } from '@clearbase/contracts';
import { Session } from '../auth/session';
import { testDetail } from './catalogue-testing';
import { StockPage } from './stock-page';

async function render(role: Role, detail: StockDetail = testDetail) {
  TestBed.configureTestingModule({
    imports: [StockPage],
    providers: [
      provideZonelessChangeDetection(),
      { provide: MATERIAL_ANIMATIONS, useValue: { animationsDisabled: true } },
      provideHttpClient(),
      provideHttpClientTesting(),
      provideRouter([]),
    ],
  });
  const backend = TestBed.inject(HttpTestingController);
  TestBed.inject(Session).load().subscribe();
  const me: User = { id: 1, email: `${role}@lab.test`, name: 'Test', role };
  backend.expectOne('/api/auth/me').flush(me);
  const fixture = TestBed.createComponent(StockPage);
  fixture.componentRef.setInput('id', '1');
  await fixture.whenStable();
  backend.expectOne('/api/stocks/1').flush(detail);
  await fixture.whenStable();
  const el = fixture.nativeElement as HTMLElement;
  return {
    fixture,
    backend,
    el,
    page: TestbedHarnessEnvironment.loader(fixture),
    root: TestbedHarnessEnvironment.documentRootLoader(fixture),
  };
}

describe('StockPage', () => {
  it('shows a customer the stock sheet and nothing of its profiles', async () => {
    const { el } = await render('customer');
    expect(el.querySelector('[data-testid="stock-name"]')!.textContent).toBe('Glasswing 400');
    expect(el.querySelector('[data-testid="sheet-ei"]')!.textContent).toContain('EI 400');
    expect(el.querySelector('[data-testid="sheet-latitude"]')!.textContent).toContain(
      '1 stop under, 3 stops over',
    );
    expect(el.querySelector('[data-testid="sheet-exponent"]')!.textContent).toBe('p = 1.3');
    expect(el.querySelector('[data-testid="sheet-polyester"]')).not.toBeNull();
    expect(el.querySelector('[data-testid^="timeline-"]')).toBeNull();
    expect(el.querySelector('[data-testid="profile-import"]')).toBeNull();
    expect(el.querySelector('[data-testid="edit-sheet"]')).toBeNull();
  });

  it('lets a manager change the sheet, checking p before sending, and shows the saved sheet', async () => {
    const { page, root, backend, fixture, el } = await render('manager');
    await (await page.getHarness(MatButtonHarness.with({ selector: '[data-testid="edit-sheet"]' }))).click();
    const dialog = await root.getHarness(MatDialogHarness);
    const exponent = await dialog.getHarness(
      MatInputHarness.with({ selector: '[data-testid="sheet-dialog-exponent"]' }),
    );
    expect(await exponent.getValue()).toBe('1.3');
    await exponent.setValue('2.5');
    await (await dialog.getHarness(MatButtonHarness.with({ text: 'Save sheet' }))).click();
    expect(await dialog.getText()).toContain('At most 2');
    backend.expectNone((r) => r.method === 'PATCH');

    await exponent.setValue('1.4');
    await (await dialog.getHarness(MatButtonHarness.with({ text: 'Save sheet' }))).click();
    const req = backend.expectOne((r) => r.method === 'PATCH' && r.url === '/api/stocks/1');
    expect(req.request.body).toMatchObject({
      reciprocityExponent: 1.4,
      recommendedEi: 400,
      latitudeOverStops: 3,
    });
    const saved = { ...testDetail.stock, reciprocityExponent: 1.4 };
    req.flush({ stock: saved });
    await fixture.whenStable();
    backend.expectOne('/api/stocks/1').flush({ ...testDetail, stock: saved });
    await fixture.whenStable();
    expect(el.querySelector('[data-testid="sheet-exponent"]')!.textContent).toBe('p = 1.4');
  });

  it('offers staff a calibration of the stock and links a calibrated version to its report', async () => {
    const { backend, fixture, el } = await render('operator');
    backend.expectOne('/api/calibrations?stockId=1').flush({
      calibrations: [
        { id: 7, profileVersionId: 102 },
        { id: 6, profileVersionId: null },
      ],
    });
    await fixture.whenStable();
    expect(el.querySelector('[data-testid="calibrate-stock"]')!.getAttribute('href')).toBe(
      '/calibration?stock=1',
    );
    expect(el.querySelector('[data-testid="calibration-report-102"]')!.getAttribute('href')).toBe(
      '/calibration/7',
    );
    expect(el.querySelectorAll('[data-testid^="calibration-report-"]')).toHaveLength(1);
  });

  it('asks no calibrations for a customer and offers no calibration', async () => {
    const { backend, el } = await render('customer');
    backend.expectNone((r) => r.url.startsWith('/api/calibrations'));
    expect(el.querySelector('[data-testid="calibrate-stock"]')).toBeNull();
  });

  it('makes an operator’s new draft from a published version and shows the page again', async () => {
    const { page, backend, fixture, el } = await render('operator');
    await (
      await page.getHarness(MatButtonHarness.with({ selector: '[data-testid="new-draft-101"]' }))
    ).click();
    const req = backend.expectOne('/api/profiles/10/versions');
    expect(req.request.method).toBe('POST');
    expect(req.request.body).toEqual({ parentVersionId: 101 });
    const draft = { ...testDetail.profiles[0]!.versions[2]!, id: 103, version: 4, parentVersionId: 101 };
    req.flush({ version: draft }, { status: 201, statusText: 'Created' });
    await fixture.whenStable();
    const profile = testDetail.profiles[0]!;
    backend
      .expectOne('/api/stocks/1')
      .flush({ ...testDetail, profiles: [{ ...profile, versions: [...profile.versions, draft] }] });
    await fixture.whenStable();
    expect(el.querySelector('[data-testid="version-103"]')!.textContent).toContain('from version 2');
    expect(el.querySelector('[data-testid="retire-101"]')).toBeNull();
  });

  it('retires a published version only after a manager confirms', async () => {
    const { page, root, backend, fixture } = await render('manager');
    await (await page.getHarness(MatButtonHarness.with({ selector: '[data-testid="retire-101"]' }))).click();
    let dialog = await root.getHarness(MatDialogHarness);
    expect(await dialog.getTitleText()).toBe('Retire version 2?');
    await (await dialog.getHarness(MatButtonHarness.with({ text: 'Cancel' }))).click();
    backend.expectNone('/api/profile-versions/101/retire');

    await (await page.getHarness(MatButtonHarness.with({ selector: '[data-testid="retire-101"]' }))).click();
    dialog = await root.getHarness(MatDialogHarness);
    await (await dialog.getHarness(MatButtonHarness.with({ text: 'Retire' }))).click();
    const req = backend.expectOne('/api/profile-versions/101/retire');
    expect(req.request.method).toBe('POST');
    req.flush({ version: { ...testDetail.profiles[0]!.versions[1], status: 'retired' } });
    await fixture.whenStable();
    backend.expectOne('/api/stocks/1').flush(testDetail);
  });

  it('compares two versions as a table of path, before and after', async () => {
    const { page, backend, fixture, el } = await render('operator');
    await (
      await page.getHarness(MatButtonHarness.with({ selector: '[data-testid="compare-run-10"]' }))
    ).click();
    backend.expectOne('/api/profile-versions/101/diff/102').flush({
      from: 101,
      to: 102,
      changes: [{ path: 'balance.magentaGreen', before: 0, after: -4 }],
    });
    await fixture.whenStable();
    const rows = [...el.querySelectorAll('[data-testid="compare-table-10"] tbody tr')].map((r) =>
      [...r.querySelectorAll('td')].map((td) => td.textContent!.trim()),
    );
    expect(rows).toEqual([['balance.magentaGreen', '0', '-4']]);
  });

  it('lists each schema error of an imported document with its path', async () => {
    const { backend, fixture, el } = await render('operator');
    const input = el.querySelector('[data-testid="profile-import-file"]') as HTMLInputElement;
    const file = new File(['{"schemaVersion":1}'], 'glasswing.json', { type: 'application/json' });
    Object.defineProperty(input, 'files', { value: [file] });
    input.dispatchEvent(new Event('change'));
    const req = backend.expectOne('/api/profiles/import');
    expect(req.request.body).toBeInstanceOf(FormData);
    req.flush(
      {
        type: 'about:blank',
        title: 'Bad Request',
        status: 400,
        detail: 'The profile document does not match the schema.',
        errors: [
          { path: 'curves.red.points', message: 'Required' },
          { path: 'balance', message: 'Required' },
        ],
      },
      { status: 400, statusText: 'Bad Request' },
    );
    await fixture.whenStable();
    const lines = [...el.querySelectorAll('[data-testid="profile-import-path-error"]')].map((li) =>
      li.textContent!.replace(/\s+/g, ' ').trim(),
    );
    expect(lines).toEqual(['curves.red.points Required', 'balance Required']);
  });
});
