import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { provideZonelessChangeDetection } from '@angular/core';
import { type ComponentFixture, TestBed } from '@angular/core/testing';
import { provideRouter } from '@angular/router';
import { SignUpPage } from './sign-up-page';

async function render() {
  TestBed.configureTestingModule({
    imports: [SignUpPage],
    providers: [
      provideZonelessChangeDetection(),
      provideHttpClient(),
      provideHttpClientTesting(),
      provideRouter([]),
    ],
  });
  const fixture = TestBed.createComponent(SignUpPage);
  await fixture.whenStable();
  return { fixture, backend: TestBed.inject(HttpTestingController) };
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

async function fillAndSubmit(fixture: ComponentFixture<unknown>, password = 'a-long-password') {
  type(fixture, 'sign-up-name', 'Wren Hollis');
  type(fixture, 'sign-up-email', 'wren@example.test');
  type(fixture, 'sign-up-password', password);
  el(fixture, 'sign-up-submit')!.click();
  await fixture.whenStable();
}

describe('SignUpPage', () => {
  it('sends nothing while the password is shorter than the server allows', async () => {
    const { fixture, backend } = await render();
    await fillAndSubmit(fixture, 'short');
    expect((fixture.nativeElement as HTMLElement).textContent).toContain('Use at least 10 characters');
    backend.expectNone('/api/auth/signup');
  });

  it('says to check the mail once the server has the sign-up', async () => {
    const { fixture, backend } = await render();
    await fillAndSubmit(fixture);
    const req = backend.expectOne('/api/auth/signup');
    expect(req.request.body).toEqual({
      name: 'Wren Hollis',
      email: 'wren@example.test',
      password: 'a-long-password',
    });
    req.flush(
      { status: 'check-your-mail', detail: 'We sent a link to wren@example.test.' },
      { status: 202, statusText: 'Accepted' },
    );
    await fixture.whenStable();
    expect(el(fixture, 'sign-up-sent')?.textContent).toContain('We sent a link to wren@example.test.');
  });

  it('shows the server’s reason when it is limiting sign-ups', async () => {
    const { fixture, backend } = await render();
    await fillAndSubmit(fixture);
    backend
      .expectOne('/api/auth/signup')
      .flush(
        { title: 'Too Many Requests', status: 429, detail: 'Too many sign-up requests from here.' },
        { status: 429, statusText: 'Too Many Requests' },
      );
    await fixture.whenStable();
    expect(el(fixture, 'sign-up-error')?.textContent).toContain('Too many sign-up requests from here.');
  });
});
