import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { Component, provideZonelessChangeDetection } from '@angular/core';
import { type ComponentFixture, TestBed } from '@angular/core/testing';
import { provideRouter, Router } from '@angular/router';
import { SignInPage } from './sign-in-page';

@Component({ template: 'page' })
class Blank {}

async function render(returnUrl?: string) {
  TestBed.configureTestingModule({
    imports: [SignInPage],
    providers: [
      provideZonelessChangeDetection(),
      provideHttpClient(),
      provideHttpClientTesting(),
      provideRouter([{ path: '**', component: Blank }]),
    ],
  });
  const fixture = TestBed.createComponent(SignInPage);
  if (returnUrl !== undefined) fixture.componentRef.setInput('returnUrl', returnUrl);
  await fixture.whenStable();
  return { fixture, backend: TestBed.inject(HttpTestingController), router: TestBed.inject(Router) };
}

function el(fixture: ComponentFixture<unknown>, testId: string): HTMLElement | null {
  return (fixture.nativeElement as HTMLElement).querySelector(`[data-testid="${testId}"]`);
}

function type(fixture: ComponentFixture<unknown>, testId: string, value: string): void {
  const input = el(fixture, testId) as HTMLInputElement;
  input.value = value;
  input.dispatchEvent(new Event('input'));
  input.dispatchEvent(new Event('blur'));
}

async function submit(fixture: ComponentFixture<unknown>): Promise<void> {
  el(fixture, 'sign-in-submit')!.click();
  await fixture.whenStable();
}

function text(fixture: ComponentFixture<unknown>): string {
  return (fixture.nativeElement as HTMLElement).textContent ?? '';
}

describe('SignInPage', () => {
  it('asks for both fields and sends nothing when they are empty', async () => {
    const { fixture, backend } = await render();
    await submit(fixture);

    expect(text(fixture)).toContain('Enter your e-mail address');
    expect(text(fixture)).toContain('Enter your password');
    backend.expectNone('/api/auth/login');
  });

  it('rejects an e-mail address that is not one', async () => {
    const { fixture, backend } = await render();
    type(fixture, 'sign-in-email', 'not-an-address');
    type(fixture, 'sign-in-password', 'secret');
    await submit(fixture);

    expect(text(fixture)).toContain('Enter a valid e-mail address');
    backend.expectNone('/api/auth/login');
  });

  it('shows the server’s reason when the password is wrong and clears the password', async () => {
    const { fixture, backend } = await render();
    type(fixture, 'sign-in-email', 'ada@lab.test');
    type(fixture, 'sign-in-password', 'wrong password');
    await submit(fixture);

    const req = backend.expectOne('/api/auth/login');
    expect(req.request.body).toEqual({ email: 'ada@lab.test', password: 'wrong password' });
    req.flush(
      {
        type: 'about:blank',
        title: 'Unauthorized',
        status: 401,
        detail: 'The e-mail address or password is wrong.',
      },
      { status: 401, statusText: 'Unauthorized' },
    );
    await fixture.whenStable();

    expect(el(fixture, 'sign-in-error')?.textContent).toContain('The e-mail address or password is wrong.');
    expect((el(fixture, 'sign-in-password') as HTMLInputElement).value).toBe('');
    expect((el(fixture, 'sign-in-email') as HTMLInputElement).value).toBe('ada@lab.test');
    expect(text(fixture)).not.toContain('Enter your password');
  });

  it('says so when sign-in attempts are being limited', async () => {
    const { fixture, backend } = await render();
    type(fixture, 'sign-in-email', 'ada@lab.test');
    type(fixture, 'sign-in-password', 'whatever');
    await submit(fixture);

    backend
      .expectOne('/api/auth/login')
      .flush(
        { title: 'Too Many Requests', status: 429, detail: 'Wait a minute before trying again.' },
        { status: 429, statusText: 'Too Many Requests' },
      );
    await fixture.whenStable();

    expect(el(fixture, 'sign-in-error')?.textContent).toContain(
      'Too many attempts. Wait a minute before trying again.',
    );
  });

  it('shows per-field errors from a schema problem next to the field', async () => {
    const { fixture, backend } = await render();
    type(fixture, 'sign-in-email', 'ada@lab.test');
    type(fixture, 'sign-in-password', 'whatever');
    await submit(fixture);

    backend.expectOne('/api/auth/login').flush(
      {
        title: 'Bad Request',
        status: 400,
        detail: 'The request has errors.',
        errors: [{ path: 'email', message: 'Unknown domain' }],
      },
      { status: 400, statusText: 'Bad Request' },
    );
    await fixture.whenStable();

    expect(el(fixture, 'sign-in-email-problem')?.textContent).toContain('Unknown domain');
  });

  it('goes to the return URL after signing in', async () => {
    const { fixture, backend, router } = await render('/admin/users');
    type(fixture, 'sign-in-email', 'Ada@Lab.test');
    type(fixture, 'sign-in-password', 'correct horse');
    await submit(fixture);

    backend
      .expectOne('/api/auth/login')
      .flush({ user: { id: 1, email: 'ada@lab.test', name: 'Ada Quist', role: 'admin' } });
    await fixture.whenStable();

    expect(router.url).toBe('/admin/users');
  });

  it('ignores a return URL that leaves the app', async () => {
    const { fixture, backend, router } = await render('https://elsewhere.test/');
    type(fixture, 'sign-in-email', 'ada@lab.test');
    type(fixture, 'sign-in-password', 'correct horse');
    await submit(fixture);

    backend
      .expectOne('/api/auth/login')
      .flush({ user: { id: 1, email: 'ada@lab.test', name: 'Ada Quist', role: 'admin' } });
    await fixture.whenStable();

    expect(router.url).toBe('/');
  });
});
