import { Component, provideZonelessChangeDetection } from '@angular/core';
import { TestBed } from '@angular/core/testing';
import { FormControl, FormGroup, ReactiveFormsModule } from '@angular/forms';
import { MATERIAL_ANIMATIONS } from '@angular/material/core';
import { AccountField } from './account-field';
import { accountValidators } from './account-validators';

@Component({
  imports: [ReactiveFormsModule, AccountField],
  template: `<form [formGroup]="form">
    <cb-account-field kind="email" [control]="form.controls.email" testId="email" errorTestId="email-error" />
    <cb-account-field
      kind="password"
      [control]="form.controls.password"
      testId="password"
      [problem]="problem"
      [revealable]="true"
    />
    <cb-account-field
      kind="new-password"
      label="Password (optional)"
      [control]="form.controls.chosen"
      testId="chosen"
      [optional]="true"
    />
  </form>`,
})
class Host {
  readonly form = new FormGroup({
    email: new FormControl('', { nonNullable: true, validators: accountValidators.email }),
    password: new FormControl('', { nonNullable: true, validators: accountValidators.password }),
    chosen: new FormControl('', { nonNullable: true, validators: accountValidators.optionalNewPassword }),
  });
  problem: string | undefined = undefined;
}

async function render() {
  TestBed.configureTestingModule({
    imports: [Host],
    providers: [
      provideZonelessChangeDetection(),
      { provide: MATERIAL_ANIMATIONS, useValue: { animationsDisabled: true } },
    ],
  });
  const fixture = TestBed.createComponent(Host);
  await fixture.whenStable();
  const root = fixture.nativeElement as HTMLElement;
  const q = (id: string) => root.querySelector<HTMLElement>(`[data-testid="${id}"]`);
  return { fixture, root, q, form: fixture.componentInstance.form };
}

describe('AccountField', () => {
  it('labels each field and gives the browser its autofill hint', async () => {
    const { root, q } = await render();
    const labels = [...root.querySelectorAll('mat-label')].map((l) => l.textContent?.trim());
    expect(labels).toEqual(['E-mail', 'Password', 'Password (optional)']);
    expect(q('email')!.getAttribute('type')).toBe('email');
    expect(q('email')!.getAttribute('autocomplete')).toBe('email');
    expect(q('password')!.getAttribute('autocomplete')).toBe('current-password');
    expect(q('chosen')!.getAttribute('autocomplete')).toBe('new-password');
    expect(root.querySelector('mat-hint')?.textContent?.trim()).toBe('At least 10 characters');
  });

  it('says what is wrong once the form is checked, and the server’s words once they are set', async () => {
    const { fixture, q, form } = await render();
    expect(q('email-error')).toBeNull();
    form.controls.email.setValue('not an address');
    form.markAllAsTouched();
    await fixture.whenStable();
    expect(q('email-error')!.textContent!.trim()).toBe('Enter a valid e-mail address');
    form.controls.email.setErrors({ server: 'Unknown domain' });
    await fixture.whenStable();
    expect(q('email-error')!.textContent!.trim()).toBe('Unknown domain');
  });

  it('leaves an optional field empty without complaint', async () => {
    const { fixture, root, form } = await render();
    form.controls.email.setValue('ada@clearbase.test');
    form.controls.password.setValue('secret');
    form.markAllAsTouched();
    await fixture.whenStable();
    expect(form.controls.chosen.valid).toBe(true);
    expect(root.querySelectorAll('mat-error')).toHaveLength(0);
  });

  it('shows a password as typed on request, and a problem given under the field', async () => {
    const { fixture, q, root } = await render();
    root.querySelector<HTMLButtonElement>('button[aria-label="Show password"]')!.click();
    await fixture.whenStable();
    expect(q('password')!.getAttribute('type')).toBe('text');
    fixture.componentInstance.problem = 'Too long';
    fixture.componentRef.changeDetectorRef.markForCheck();
    await fixture.whenStable();
    expect(q('password-problem')!.textContent).toBe('Too long');
  });
});
