import { ChangeDetectionStrategy, Component, inject, signal } from '@angular/core';
import { FormControl, FormGroup, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButton } from '@angular/material/button';
import {
  MAT_DIALOG_DATA,
  MatDialogActions,
  MatDialogClose,
  MatDialogContent,
  MatDialogRef,
  MatDialogTitle,
} from '@angular/material/dialog';
import { MatError, MatFormField, MatHint, MatLabel } from '@angular/material/form-field';
import { MatInput } from '@angular/material/input';
import type { ProfileVersion } from '@clearbase/contracts';
import { readProblem } from '../problem/read-problem';
import { ProfileVersionsApi } from './profile-versions-api';
import { lineNoteMaxLength } from '@clearbase/contracts/values';

/** What the publish dialog publishes. */
export interface PublishDialogData {
  versionId: number;
  version: number;
  stockName: string;
}

const changelogMax = lineNoteMaxLength;

/** Publishes a draft after asking for one changelog line; closes with the published version. */
@Component({
  selector: 'cb-publish-dialog',
  imports: [
    ReactiveFormsModule,
    MatDialogTitle,
    MatDialogContent,
    MatDialogActions,
    MatDialogClose,
    MatFormField,
    MatLabel,
    MatHint,
    MatError,
    MatInput,
    MatButton,
  ],
  template: `
    <h2 mat-dialog-title>Publish version {{ data.version }} of {{ data.stockName }}</h2>
    <form [formGroup]="form" (ngSubmit)="publish()">
      <mat-dialog-content>
        <p class="lede">
          A published version is frozen: rolls can pin it, and later changes go into a new draft.
        </p>
        <mat-form-field appearance="outline" class="wide">
          <mat-label>What changed, in one line</mat-label>
          <input matInput [formControl]="changelog" [maxlength]="max" data-testid="publish-changelog" />
          <mat-hint align="end">{{ changelog.value.length }} / {{ max }}</mat-hint>
          @if (changelog.hasError('required') || changelog.hasError('blank')) {
            <mat-error>Say in one line what changed.</mat-error>
          }
          @if (changelog.hasError('server')) {
            <mat-error>{{ changelog.getError('server') }}</mat-error>
          }
        </mat-form-field>
        @if (problem(); as message) {
          <div class="cb-problem" role="alert" data-testid="publish-error">{{ message }}</div>
        }
      </mat-dialog-content>
      <mat-dialog-actions align="end">
        <button mat-button type="button" mat-dialog-close>Cancel</button>
        <button mat-flat-button type="submit" [disabled]="busy()" data-testid="publish-submit">
          Publish
        </button>
      </mat-dialog-actions>
    </form>
  `,
  styles: `
    .wide {
      width: 100%;
    }
    .lede {
      margin-top: 0;
      color: var(--mat-sys-on-surface-variant);
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class PublishDialog {
  protected readonly data = inject<PublishDialogData>(MAT_DIALOG_DATA);
  private readonly ref = inject<MatDialogRef<PublishDialog, ProfileVersion>>(MatDialogRef);
  private readonly api = inject(ProfileVersionsApi);

  protected readonly max = changelogMax;
  protected readonly changelog = new FormControl('', {
    nonNullable: true,
    validators: [
      Validators.required,
      Validators.maxLength(changelogMax),
      (c) => (String(c.value).trim() ? null : { blank: true }),
    ],
  });
  protected readonly form = new FormGroup({ changelog: this.changelog });
  protected readonly busy = signal(false);
  protected readonly problem = signal<string | null>(null);

  protected publish(): void {
    this.changelog.markAsTouched();
    if (this.changelog.invalid || this.busy()) return;
    this.busy.set(true);
    this.problem.set(null);
    this.api.publish(this.data.versionId, this.changelog.value.trim()).subscribe({
      next: (version) => this.ref.close(version),
      error: (err: unknown) => {
        this.busy.set(false);
        const problem = readProblem(err);
        const field = problem.fieldErrors['body.changelog'];
        if (field) this.changelog.setErrors({ server: field });
        else this.problem.set(problem.message);
      },
    });
  }
}
