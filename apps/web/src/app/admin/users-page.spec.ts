import { type HttpTestingController } from '@angular/common/http/testing';
import { type ComponentFixture, TestBed } from '@angular/core/testing';
import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { ComponentHarness, type HarnessLoader } from '@angular/cdk/testing';
import { MatButtonHarness } from '@angular/material/button/testing';
import { MatDialogHarness } from '@angular/material/dialog/testing';
import { MatInputHarness } from '@angular/material/input/testing';
import { MatSelectHarness } from '@angular/material/select/testing';
import { MatSortHarness } from '@angular/material/sort/testing';
import { MatTableHarness } from '@angular/material/table/testing';
import type { UserRecord } from '@clearbase/contracts';
import { UsersPage } from './users-page';
import { setUpListPage } from '../lists/set-up-list-page';

/** The name line of a user's cell. */
class PersonName extends ComponentHarness {
  static hostSelector = '.person-name';
}

const me: UserRecord = {
  id: 1,
  email: 'ada@lab.test',
  name: 'Ada Quist',
  role: 'admin',
  disabled: false,
  createdAt: '2026-01-05T09:00:00.000Z',
  lastSignInAt: '2026-12-01T08:00:00.000Z',
};
const people: UserRecord[] = [
  me,
  { ...me, id: 2, email: 'ola@lab.test', name: 'Ola Brandt', role: 'operator', lastSignInAt: null },
  { ...me, id: 3, email: 'cy@home.test', name: 'Cy Orrin', role: 'customer' },
];

interface Rendered {
  fixture: ComponentFixture<UsersPage>;
  backend: HttpTestingController;
  loader: HarnessLoader;
  page: HarnessLoader;
}

async function render(users: UserRecord[] = people): Promise<Rendered> {
  const backend = setUpListPage(UsersPage, me);
  const fixture = TestBed.createComponent(UsersPage);
  await fixture.whenStable();
  backend.expectOne('/api/users').flush({ users });
  await fixture.whenStable();
  return {
    fixture,
    backend,
    loader: TestbedHarnessEnvironment.documentRootLoader(fixture),
    page: TestbedHarnessEnvironment.loader(fixture),
  };
}

async function names(page: HarnessLoader): Promise<string[]> {
  const table = await page.getHarness(MatTableHarness);
  const rows = await table.getRows();
  return Promise.all(
    rows.map(async (r) => {
      const [cell] = await r.getCells({ columnName: 'name' });
      const name = await cell!.getHarnessOrNull(PersonName);
      return name ? await (await name.host()).text() : '';
    }),
  );
}

describe('UsersPage', () => {
  it('lists every user, sorted by name', async () => {
    const { page } = await render();
    expect(await names(page)).toEqual(['Ada Quist', 'Cy Orrin', 'Ola Brandt']);
  });

  it('reverses the order when the name header is clicked', async () => {
    const { page } = await render();
    const sort = await page.getHarness(MatSortHarness);
    const [nameHeader] = await sort.getSortHeaders({ label: 'Name' });
    await nameHeader!.click();
    expect(await names(page)).toEqual(['Ola Brandt', 'Cy Orrin', 'Ada Quist']);
  });

  it('narrows the table to users matching the filter', async () => {
    const { page } = await render();
    const filter = await page.getHarness(MatInputHarness.with({ selector: '[data-testid="users-filter"]' }));
    await filter.setValue('operator');
    expect(await names(page)).toEqual(['Ola Brandt']);
    await filter.setValue('nobody at all');
    expect(await names(page)).toEqual([]);
    const table = await page.getHarness(MatTableHarness);
    expect(await (await table.host()).text()).toContain('No user matches');
  });

  it('changes a role inline and shows the server’s answer', async () => {
    const { page, backend, fixture } = await render();
    const select = await page.getHarness(MatSelectHarness.with({ selector: '[data-testid="user-role-2"]' }));
    await select.open();
    await select.clickOptions({ text: 'Lab manager' });

    const req = backend.expectOne('/api/users/2');
    expect(req.request.method).toBe('PATCH');
    expect(req.request.body).toEqual({ role: 'manager' });
    req.flush({ user: { ...people[1], role: 'manager' } });
    await fixture.whenStable();

    expect(await select.getValueText()).toBe('Lab manager');
  });

  it('does not let admins change their own role or disable themselves', async () => {
    const { page } = await render();
    const own = await page.getHarness(MatSelectHarness.with({ selector: '[data-testid="user-role-1"]' }));
    expect(await own.isDisabled()).toBe(true);
    expect(
      await page.getAllHarnesses(MatButtonHarness.with({ selector: '[data-testid="user-toggle-1"]' })),
    ).toHaveLength(0);
  });

  it('disables a user only after confirmation', async () => {
    const { page, loader, backend, fixture } = await render();
    await (
      await page.getHarness(MatButtonHarness.with({ selector: '[data-testid="user-toggle-3"]' }))
    ).click();
    let dialog = await loader.getHarness(MatDialogHarness);
    expect(await dialog.getTitleText()).toBe('Disable Cy Orrin?');
    await (await dialog.getHarness(MatButtonHarness.with({ text: 'Cancel' }))).click();
    backend.expectNone('/api/users/3');

    await (
      await page.getHarness(MatButtonHarness.with({ selector: '[data-testid="user-toggle-3"]' }))
    ).click();
    dialog = await loader.getHarness(MatDialogHarness);
    await (await dialog.getHarness(MatButtonHarness.with({ text: 'Disable' }))).click();
    const req = backend.expectOne('/api/users/3');
    expect(req.request.body).toEqual({ disabled: true });
    req.flush({ user: { ...people[2], disabled: true } });
    await fixture.whenStable();

    const table = await page.getHarness(MatTableHarness);
    const cells = await Promise.all((await table.getRows()).map((r) => r.getCellTextByColumnName()));
    expect(cells.find((c) => c['name']?.startsWith('Cy Orrin'))?.['disabled']).toBe('Disabled');
    expect(
      await (
        await page.getHarness(MatButtonHarness.with({ selector: '[data-testid="user-toggle-3"]' }))
      ).getText(),
    ).toBe('Enable');
  });

  it('creates a user and shows the temporary password once', async () => {
    const { page, loader, backend, fixture } = await render();
    await (await page.getHarness(MatButtonHarness.with({ selector: '[data-testid="create-user"]' }))).click();
    const dialog = await loader.getHarness(MatDialogHarness);

    await (await dialog.getHarness(MatButtonHarness.with({ text: 'Create user' }))).click();
    expect(await dialog.getText()).toContain('Enter a name');
    backend.expectNone('/api/users');

    await (
      await dialog.getHarness(MatInputHarness.with({ selector: '[data-testid="create-user-name"]' }))
    ).setValue('Ines Varga');
    await (
      await dialog.getHarness(MatInputHarness.with({ selector: '[data-testid="create-user-email"]' }))
    ).setValue('ines@lab.test');
    const role = await dialog.getHarness(MatSelectHarness);
    await role.open();
    await role.clickOptions({ text: 'Operator' });
    await (await dialog.getHarness(MatButtonHarness.with({ text: 'Create user' }))).click();

    const req = backend.expectOne((r) => r.method === 'POST' && r.url === '/api/users');
    expect(req.request.body).toEqual({ email: 'ines@lab.test', name: 'Ines Varga', role: 'operator' });
    const created: UserRecord = { ...people[1]!, id: 9, email: 'ines@lab.test', name: 'Ines Varga' };
    req.flush(
      { user: created, temporaryPassword: 'amber-ink-4711-quiet' },
      { status: 201, statusText: 'Created' },
    );
    await fixture.whenStable();

    expect(await dialog.getText()).toContain('amber-ink-4711-quiet');
    await (await dialog.getHarness(MatButtonHarness.with({ text: 'Done' }))).click();
    await fixture.whenStable();
    expect(await loader.getAllHarnesses(MatDialogHarness)).toHaveLength(0);
    expect(await names(page)).toContain('Ines Varga');
  });

  it('shows the server’s field errors in the create dialog', async () => {
    const { page, loader, backend, fixture } = await render();
    await (await page.getHarness(MatButtonHarness.with({ selector: '[data-testid="create-user"]' }))).click();
    const dialog = await loader.getHarness(MatDialogHarness);
    await (
      await dialog.getHarness(MatInputHarness.with({ selector: '[data-testid="create-user-name"]' }))
    ).setValue('Cy Again');
    await (
      await dialog.getHarness(MatInputHarness.with({ selector: '[data-testid="create-user-email"]' }))
    ).setValue('cy@home.test');
    await (await dialog.getHarness(MatButtonHarness.with({ text: 'Create user' }))).click();

    backend
      .expectOne((r) => r.method === 'POST' && r.url === '/api/users')
      .flush(
        {
          type: 'about:blank',
          title: 'Conflict',
          status: 409,
          detail: 'A user with this e-mail address exists.',
          errors: [{ path: 'email', message: 'Already in use' }],
        },
        { status: 409, statusText: 'Conflict' },
      );
    await fixture.whenStable();

    const shown = await dialog.getText();
    expect(shown).toContain('A user with this e-mail address exists.');
    expect(shown).toContain('Already in use');
  });
});
