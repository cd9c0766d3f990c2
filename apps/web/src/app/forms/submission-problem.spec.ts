import { HttpErrorResponse } from '@angular/common/http';
import { provideZonelessChangeDetection } from '@angular/core';
import { TestBed } from '@angular/core/testing';
import { FormControl, FormGroup } from '@angular/forms';
import { throwError } from 'rxjs';
import { FormSubmission } from './form-submission';
import { SubmissionProblem } from './submission-problem';

describe('SubmissionProblem', () => {
  it('shows nothing until the server refuses, then its sentence and the complaints no field claimed', async () => {
    TestBed.configureTestingModule({ providers: [provideZonelessChangeDetection()] });
    const submission = new FormSubmission(new FormGroup({ name: new FormControl('') }));
    const fixture = TestBed.createComponent(SubmissionProblem);
    fixture.componentRef.setInput('submission', submission);
    fixture.componentRef.setInput('testId', 'thing-error');
    await fixture.whenStable();
    const el = fixture.nativeElement as HTMLElement;
    expect(el.querySelector('[data-testid="thing-error"]')).toBeNull();

    const refusal = new HttpErrorResponse({
      status: 422,
      error: {
        type: 'about:blank',
        title: 'Unprocessable',
        status: 422,
        detail: 'Check the fields.',
        errors: [
          { path: 'body.name', message: 'Taken' },
          { path: 'body.colour', message: 'Unknown' },
        ],
      },
    });
    submission.send(
      throwError(() => refusal),
      () => undefined,
    );
    await fixture.whenStable();
    const banner = el.querySelector('[data-testid="thing-error"]')!;
    expect(banner.getAttribute('role')).toBe('alert');
    expect(banner.textContent).toContain('Check the fields.');
    expect(banner.textContent).toContain('body.colour: Unknown');
    expect(banner.textContent).not.toContain('Taken');
  });
});
