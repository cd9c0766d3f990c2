import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { provideZonelessChangeDetection } from '@angular/core';
import { TestBed } from '@angular/core/testing';
import { provideRouter } from '@angular/router';
import { VerifyEmailPage } from './verify-email-page';

async function render(token?: string) {
  TestBed.configureTestingModule({
    imports: [VerifyEmailPage],
    providers: [
      provideZonelessChangeDetection(),
      provideHttpClient(),
      provideHttpClientTesting(),
      provideRouter([]),
    ],
  });
  const fixture = TestBed.createComponent(VerifyEmailPage);
  if (token) fixture.componentRef.setInput('token', token);
  await fixture.whenStable();
  return { fixture, backend: TestBed.inject(HttpTestingController) };
}

const byTestId = (root: HTMLElement, id: string) => root.querySelector(`[data-testid="${id}"]`);

describe('VerifyEmailPage', () => {
  it('confirms the token from the link and offers to sign in', async () => {
    const { fixture, backend } = await render('tok-1234567890abcdefghij');
    const req = backend.expectOne('/api/auth/signup/verify');
    expect(req.request.body).toEqual({ token: 'tok-1234567890abcdefghij' });
    req.flush({ email: 'wren@example.test' });
    await fixture.whenStable();
    const root = fixture.nativeElement as HTMLElement;
    expect(byTestId(root, 'verify-done')?.textContent).toContain('wren@example.test is confirmed');
    expect(byTestId(root, 'verify-sign-in')).not.toBeNull();
  });

  it('shows why an expired link failed and offers a new one', async () => {
    const { fixture, backend } = await render('tok-1234567890abcdefghij');
    backend
      .expectOne('/api/auth/signup/verify')
      .flush(
        { title: 'Gone', status: 410, detail: 'This link has expired. Ask for a new one or sign up again.' },
        { status: 410, statusText: 'Gone' },
      );
    await fixture.whenStable();
    const root = fixture.nativeElement as HTMLElement;
    expect(byTestId(root, 'verify-error')?.textContent).toContain('This link has expired.');
    expect(root.textContent).toContain('Send a new link');
  });

  it('asks for the link again when the address has no token', async () => {
    const { fixture, backend } = await render();
    backend.expectNone('/api/auth/signup/verify');
    expect(byTestId(fixture.nativeElement as HTMLElement, 'verify-error')?.textContent).toContain(
      'no confirmation token',
    );
  });
});
