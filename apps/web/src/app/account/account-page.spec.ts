import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { provideZonelessChangeDetection } from '@angular/core';
import { type ComponentFixture, TestBed } from '@angular/core/testing';
import { AccountPage } from './account-page';

async function render() {
  TestBed.configureTestingModule({
    imports: [AccountPage],
    providers: [provideZonelessChangeDetection(), provideHttpClient(), provideHttpClientTesting()],
  });
  const fixture = TestBed.createComponent(AccountPage);
  await fixture.whenStable();
  return { fixture, backend: TestBed.inject(HttpTestingController) };
}

function fill(fixture: ComponentFixture<AccountPage>, values: Record<string, string>): void {
  for (const [testId, value] of Object.entries(values)) {
    const input = (fixture.nativeElement as HTMLElement).querySelector<HTMLInputElement>(
      `[data-testid="${testId}"]`,
    )!;
    input.value = value;
    input.dispatchEvent(new Event('input'));
  }
}

async function submit(fixture: ComponentFixture<AccountPage>): Promise<string> {
  (fixture.nativeElement as HTMLElement)
    .querySelector<HTMLButtonElement>('[data-testid="change-password"]')!
    .click();
  await fixture.whenStable();
  return (fixture.nativeElement as HTMLElement).textContent ?? '';
}

describe('AccountPage', () => {
  it('refuses a short new password and two that differ, without calling the server', async () => {
    const { fixture, backend } = await render();
    fill(fixture, { 'current-password': 'old secret', 'new-password': 'short', 'repeat-password': 'other' });
    const text = await submit(fixture);

    expect(text).toContain('Use at least 10 characters');
    expect(text).toContain('The two new passwords differ');
    backend.expectNone('/api/auth/password');
  });

  it('changes the password and says so', async () => {
    const { fixture, backend } = await render();
    fill(fixture, {
      'current-password': 'old secret',
      'new-password': 'a longer new secret',
      'repeat-password': 'a longer new secret',
    });
    await submit(fixture);

    const req = backend.expectOne('/api/auth/password');
    expect(req.request.body).toEqual({ currentPassword: 'old secret', newPassword: 'a longer new secret' });
    req.flush(null, { status: 204, statusText: 'No Content' });
    await fixture.whenStable();

    expect((fixture.nativeElement as HTMLElement).textContent).toContain('Your password is changed.');
  });

  it('shows the server’s field error when the current password is wrong', async () => {
    const { fixture, backend } = await render();
    fill(fixture, {
      'current-password': 'not it',
      'new-password': 'a longer new secret',
      'repeat-password': 'a longer new secret',
    });
    await submit(fixture);

    backend.expectOne('/api/auth/password').flush(
      {
        title: 'Bad Request',
        status: 400,
        detail: 'The password was not changed.',
        errors: [{ path: 'currentPassword', message: 'This is not your current password' }],
      },
      { status: 400, statusText: 'Bad Request' },
    );
    await fixture.whenStable();

    const text = (fixture.nativeElement as HTMLElement).textContent ?? '';
    expect(text).toContain('The password was not changed.');
    expect(text).toContain('This is not your current password');
  });
});
