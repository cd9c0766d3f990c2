import { HttpErrorResponse } from '@angular/common/http';
import { FormControl, FormGroup, Validators } from '@angular/forms';
import { of, Subject, throwError } from 'rxjs';
import { FormSubmission } from './form-submission';

function problemResponse(status: number, body: object): HttpErrorResponse {
  return new HttpErrorResponse({ status, error: body });
}

describe('FormSubmission', () => {
  it('sends nothing while the form is invalid and shows every field as touched', () => {
    const form = new FormGroup({ name: new FormControl('', Validators.required) });
    const submission = new FormSubmission(form);

    expect(submission.ready()).toBe(false);
    expect(form.controls.name.touched).toBe(true);
  });

  it('is busy while the request is on its way and hands the answer on', () => {
    const form = new FormGroup({ name: new FormControl('Roll 12') });
    const submission = new FormSubmission(form);
    const answer = new Subject<string>();
    const done = vi.fn();

    expect(submission.ready()).toBe(true);
    submission.send(answer, done);
    expect(submission.busy()).toBe(true);
    expect(submission.ready()).toBe(false);
    answer.next('saved');

    expect(done).toHaveBeenCalledWith('saved');
    expect(submission.busy()).toBe(false);
  });

  it('puts the server’s field complaints on their controls and keeps the rest for a banner', () => {
    const form = new FormGroup({ iso: new FormControl(100), notes: new FormControl('') });
    const submission = new FormSubmission(form);
    const refused = vi.fn();
    const failure = problemResponse(422, {
      title: 'The stock is not valid',
      errors: [
        { path: 'body.iso', message: 'At most 25600' },
        { path: 'body.colour', message: 'Unknown field' },
      ],
    });

    submission.send(
      throwError(() => failure),
      () => undefined,
      refused,
    );

    expect(submission.problem()).toBe('The stock is not valid');
    expect(form.controls.iso.errors).toEqual({ server: 'At most 25600' });
    expect(submission.unclaimed()).toEqual(['body.colour: Unknown field']);
    expect(refused).toHaveBeenCalledWith(expect.objectContaining({ status: 422 }));
    expect(submission.busy()).toBe(false);
  });

  it('clears the last refusal when it sends again', () => {
    const form = new FormGroup({ iso: new FormControl(100) });
    const submission = new FormSubmission(form);
    submission.send(
      throwError(() => problemResponse(409, { title: 'Taken', errors: [{ path: 'body.x', message: 'no' }] })),
      () => undefined,
    );

    submission.send(of(1), () => undefined);

    expect(submission.problem()).toBeNull();
    expect(submission.unclaimed()).toEqual([]);
  });

  it('maps paths with the function it is given', () => {
    const form = new FormGroup({ name: new FormControl('') });
    const submission = new FormSubmission(form, (path) =>
      path === 'body.profile.name' ? form.get('name') : null,
    );

    submission.send(
      throwError(() =>
        problemResponse(422, { title: 'Bad', errors: [{ path: 'body.profile.name', message: 'Too long' }] }),
      ),
      () => undefined,
    );

    expect(form.controls.name.errors).toEqual({ server: 'Too long' });
    expect(submission.unclaimed()).toEqual([]);
  });
});
