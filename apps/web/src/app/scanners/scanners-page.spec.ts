import { TestBed } from '@angular/core/testing';
import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { MatButtonHarness } from '@angular/material/button/testing';
import { MatDialogHarness } from '@angular/material/dialog/testing';
import { MatInputHarness } from '@angular/material/input/testing';
import { MatSelectHarness } from '@angular/material/select/testing';
import { MatTableHarness } from '@angular/material/table/testing';
import type { Role, Scanner } from '@clearbase/contracts';
import { ScannersPage } from './scanners-page';
import { setUpListPage } from '../lists/set-up-list-page';

const scanners: Scanner[] = [
  {
    id: 1,
    name: 'Copy stand, bench 1',
    kind: 'camera-rig',
    inputProfile: {
      name: 'Copy stand, bench 1',
      encoding: 'linear',
      gamma: 1,
      blackLevel: [0.004, 0.004, 0.004],
      gains: [1, 1.18, 1.42],
    },
    createdAt: '2026-11-01T09:00:00.000Z',
  },
];

async function render(role: Role) {
  const backend = setUpListPage(ScannersPage, { id: 1, email: `${role}@lab.test`, name: 'Test', role });
  const fixture = TestBed.createComponent(ScannersPage);
  await fixture.whenStable();
  backend.expectOne('/api/scanners').flush({ scanners });
  await fixture.whenStable();
  const page = TestbedHarnessEnvironment.loader(fixture);
  const root = TestbedHarnessEnvironment.documentRootLoader(fixture);
  const doc = (fixture.nativeElement as HTMLElement).ownerDocument;
  const shown = (id: string) => doc.querySelector(`[data-testid="${id}"]`)?.textContent?.trim() ?? null;
  return { fixture, backend, page, root, shown };
}

async function openDialog(page: Awaited<ReturnType<typeof render>>, button: string) {
  await (
    await page.page.getHarness(MatButtonHarness.with({ selector: `[data-testid="${button}"]` }))
  ).click();
  const dialog = await page.root.getHarness(MatDialogHarness);
  const field = (id: string) =>
    dialog.getHarness(MatInputHarness.with({ selector: `[data-testid="${id}"]` }));
  const submit = async () =>
    (await dialog.getHarness(MatButtonHarness.with({ selector: '[data-testid="scanner-submit"]' }))).click();
  return { dialog, field, submit };
}

describe('ScannersPage', () => {
  it('lists each scanner with its encoding, black level and gains', async () => {
    const { page } = await render('operator');
    const table = await page.getHarness(MatTableHarness);
    const [row] = await Promise.all((await table.getRows()).map((r) => r.getCellTextByColumnName()));
    expect(row).toMatchObject({
      name: 'Copy stand, bench 1',
      kind: 'Camera rig',
      encoding: 'Linear',
      blackLevel: '0.004 · 0.004 · 0.004',
      gains: '1 · 1.18 · 1.42',
    });
  });

  it('gives operators no way to add or change scanners', async () => {
    const { page } = await render('operator');
    expect(await page.getAllHarnesses(MatButtonHarness.with({ text: /New scanner|Edit/ }))).toHaveLength(0);
  });

  it('checks the input profile before sending: name, black level range, gains above 0', async () => {
    const r = await render('manager');
    const { field, submit } = await openDialog(r, 'new-scanner');
    await (await field('scanner-black-1')).setValue('0.6');
    await (await field('scanner-gain-2')).setValue('0');
    await submit();
    expect(r.shown('scanner-name-error')).toBe('Required');
    expect(r.shown('scanner-black-error-1')).toBe('At most 0.5');
    expect(r.shown('scanner-gain-error-2')).toBe('Above 0');
    r.backend.expectNone('/api/scanners');
  });

  it('asks for a gamma only for a pure gamma encoding, and checks it before sending', async () => {
    const r = await render('manager');
    const { field, submit, dialog } = await openDialog(r, 'new-scanner');
    expect(
      await dialog.getAllHarnesses(MatInputHarness.with({ selector: '[data-testid="scanner-gamma"]' })),
    ).toHaveLength(0);
    const encoding = await dialog.getHarness(
      MatSelectHarness.with({ selector: '[data-testid="scanner-encoding"]' }),
    );
    await encoding.open();
    await encoding.clickOptions({ text: 'Pure gamma' });
    await (await field('scanner-gamma')).setValue('0');
    await submit();
    expect(r.shown('scanner-gamma-error')).toBe('At least 0.2');
    r.backend.expectNone('/api/scanners');
  });

  it('adds a scanner and shows the server’s complaint under the channel it names', async () => {
    const r = await render('manager');
    const { field, submit } = await openDialog(r, 'new-scanner');
    await (await field('scanner-name')).setValue('Flatbed for sheet film');
    await (await field('scanner-black-0')).setValue('0.01');
    await (await field('scanner-gain-1')).setValue('1.02');
    await submit();
    const post = r.backend.expectOne((q) => q.method === 'POST' && q.url === '/api/scanners');
    expect(post.request.body).toEqual({
      name: 'Flatbed for sheet film',
      kind: 'lab-scanner',
      inputProfile: {
        name: 'Flatbed for sheet film',
        encoding: 'linear',
        gamma: 1,
        blackLevel: [0.01, 0, 0],
        gains: [1, 1.02, 1],
      },
    });
    post.flush(
      {
        type: 'about:blank',
        title: 'Bad Request',
        status: 400,
        detail: 'The request does not match the schema.',
        errors: [{ path: 'body.inputProfile.gains.1', message: 'Too small: expected number to be >0' }],
      },
      { status: 400, statusText: 'Bad Request' },
    );
    await r.fixture.whenStable();
    expect(r.shown('scanner-gain-error-1')).toBe('Too small: expected number to be >0');
  });

  it('changes an existing scanner with a PATCH of its whole record', async () => {
    const r = await render('manager');
    const { field, submit } = await openDialog(r, 'edit-scanner-1');
    expect(await (await field('scanner-gain-2')).getValue()).toBe('1.42');
    await (await field('scanner-gain-2')).setValue('1.5');
    await submit();
    const patch = r.backend.expectOne('/api/scanners/1');
    expect(patch.request.method).toBe('PATCH');
    expect(patch.request.body.inputProfile.gains).toEqual([1, 1.18, 1.5]);
    patch.flush({
      scanner: { ...scanners[0], inputProfile: { ...scanners[0]!.inputProfile, gains: [1, 1.18, 1.5] } },
    });
    await r.fixture.whenStable();
    r.backend.expectOne('/api/scanners').flush({ scanners });
    expect(await r.root.getAllHarnesses(MatDialogHarness)).toHaveLength(0);
  });
});
