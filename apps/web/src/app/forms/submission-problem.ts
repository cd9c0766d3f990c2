import { ChangeDetectionStrategy, Component, input } from '@angular/core';
import type { FormSubmission } from './form-submission';

/**
 * The banner over a form the server refused: its sentence, and each complaint no field of the form claimed.
 * Shows nothing while there is no refusal.
 *
 * @example
 * <cb-submission-problem [submission]="submission" testId="new-stock-error" />
 */
@Component({
  selector: 'cb-submission-problem',
  template: `
    @if (submission().problem(); as message) {
      <div class="cb-problem" role="alert" [attr.data-testid]="testId()">
        <div>
          {{ message }}
          @for (line of submission().unclaimed(); track line) {
            <div>{{ line }}</div>
          }
        </div>
      </div>
    }
  `,
  styles: ':host { display: block; }',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class SubmissionProblem {
  readonly submission = input.required<FormSubmission>();
  /** The banner's `data-testid`. */
  readonly testId = input.required<string>();
}
