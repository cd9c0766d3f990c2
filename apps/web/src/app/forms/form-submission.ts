import { signal } from '@angular/core';
import type { AbstractControl } from '@angular/forms';
import type { Observable } from 'rxjs';
import { type ProblemMessage, readProblem } from '../problem/read-problem';
import { applyFieldProblems, bodyField } from './apply-field-problems';

/**
 * One form's trip to the server: `busy` while a request is on its way, the server's sentence in `problem`, its
 * per-field complaints on the controls they concern and the rest in `unclaimed`, for a banner.
 *
 * @example
 * protected readonly submission = new FormSubmission(this.form);
 * submit() {
 *   if (!this.submission.ready()) return;
 *   this.submission.send(this.api.save(this.form.getRawValue()), (saved) => this.ref.close(saved));
 * }
 */
export class FormSubmission {
  readonly busy = signal(false);
  readonly problem = signal<string | null>(null);
  readonly unclaimed = signal<string[]>([]);

  /** `controlFor` maps a complaint's path to its control; by default the request body's top-level field. */
  constructor(
    private readonly form: AbstractControl,
    private readonly controlFor: (path: string) => AbstractControl | null | undefined = (path) =>
      form.get(bodyField(path)),
  ) {}

  /** Shows every field's check; false while the form is invalid or a request is already on its way. */
  ready(): boolean {
    this.form.markAllAsTouched();
    return !this.form.invalid && !this.busy();
  }

  /** Sends `request`; `done` gets the answer, `refused` (after the complaints are placed) the problem. */
  send<T>(
    request: Observable<T>,
    done: (value: T) => void,
    refused?: (problem: ProblemMessage) => void,
  ): void {
    this.busy.set(true);
    this.problem.set(null);
    this.unclaimed.set([]);
    request.subscribe({
      next: (value) => {
        this.busy.set(false);
        done(value);
      },
      error: (err: unknown) => {
        this.busy.set(false);
        const p = readProblem(err);
        this.problem.set(p.message);
        this.unclaimed.set(applyFieldProblems(p.fieldErrors, this.controlFor));
        refused?.(p);
      },
    });
  }
}
