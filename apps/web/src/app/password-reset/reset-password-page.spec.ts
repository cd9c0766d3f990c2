import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { provideZonelessChangeDetection } from '@angular/core';
import { type ComponentFixture, TestBed } from '@angular/core/testing';
import { provideRouter } from '@angular/router';
import { ResetPasswordPage } from './reset-password-page';

async function render(token?: string) {
  TestBed.configureTestingModule({
    imports: [ResetPasswordPage],
    providers: [
      provideZonelessChangeDetection(),
      provideHttpClient(),
      provideHttpClientTesting(),
      provideRouter([]),
    ],
  });
  const fixture = TestBed.createComponent(ResetPasswordPage);
  if (token) fixture.componentRef.setInput('token', token);
  await fixture.whenStable();
  return { fixture, backend: TestBed.inject(HttpTestingController) };
}

const el = (fixture: ComponentFixture<unknown>, id: string) =>
  (fixture.nativeElement as HTMLElement).querySelector<HTMLElement>(`[data-testid="${id}"]`);

async function choose(fixture: ComponentFixture<unknown>, password: string, repeat: string) {
  for (const [id, value] of [
    ['reset-password', password],
    ['reset-repeat', repeat],
  ] as const) {
    const input = el(fixture, id) as HTMLInputElement;
    input.value = value;
    input.dispatchEvent(new Event('input'));
    input.dispatchEvent(new Event('blur'));
  }
  el(fixture, 'reset-submit')!.click();
  await fixture.whenStable();
}

describe('ResetPasswordPage', () => {
  it('sends nothing while the two passwords differ', async () => {
    const { fixture, backend } = await render('tok-1234567890abcdefghij');
    await choose(fixture, 'a-long-password', 'another-password');
    expect((fixture.nativeElement as HTMLElement).textContent).toContain('The two passwords differ');
    backend.expectNone('/api/auth/password-reset/confirm');
  });

  it('sets the password with the link’s token and says so', async () => {
    const { fixture, backend } = await render('tok-1234567890abcdefghij');
    await choose(fixture, 'a-long-password', 'a-long-password');
    const req = backend.expectOne('/api/auth/password-reset/confirm');
    expect(req.request.body).toEqual({ token: 'tok-1234567890abcdefghij', newPassword: 'a-long-password' });
    req.flush({ email: 'cass@example.test' });
    await fixture.whenStable();
    expect(el(fixture, 'reset-done')?.textContent).toContain('The password of cass@example.test is changed.');
  });

  it('shows why a used link no longer works', async () => {
    const { fixture, backend } = await render('tok-1234567890abcdefghij');
    await choose(fixture, 'a-long-password', 'a-long-password');
    backend
      .expectOne('/api/auth/password-reset/confirm')
      .flush(
        { title: 'Bad Request', status: 400, detail: 'This link is not valid or was already used.' },
        { status: 400, statusText: 'Bad Request' },
      );
    await fixture.whenStable();
    expect(el(fixture, 'reset-error')?.textContent).toContain('already used');
  });
});
