import { ChangeDetectionStrategy, Component, inject, signal } from '@angular/core';
import { takeUntilDestroyed } from '@angular/core/rxjs-interop';
import { NonNullableFormBuilder, ReactiveFormsModule, Validators } from '@angular/forms';
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
import { MatOption, MatSelect } from '@angular/material/select';
import type { CreateScannerRequest, Scanner, ScannerKind, ScannerProfile } from '@clearbase/contracts';
import { bodyPath } from '../forms/apply-field-problems';
import { fieldErrorText } from '../forms/field-error-text';
import { FormSubmission } from '../forms/form-submission';
import { SubmissionProblem } from '../forms/submission-problem';
import { kindChoices, kindLabel } from './scanner-labels';
import { ScannersApi } from './scanners-api';

// The server's bounds (libs/contracts profile-document.ts): black level 0 to 0.5 of full scale, gains and gamma
// above 0. A gain above 16 is four stops of correction, beyond any light source worth scanning with (our choice).
const blackLevelMax = 0.5;
const gainMax = 16;
// 1.8 to 2.4 covers the gammas scanners encode with; 0.2 to 5 only keeps a typo out (our choice).
const gammaRange = { min: 0.2, max: 5 } as const;

/** The three channels, in the order the profile lists them. */
export const channelNames = ['Red', 'Green', 'Blue'] as const;

/** Adds a scanner (no data) or changes one: its kind and its input profile. Closes with the saved scanner. */
@Component({
  selector: 'cb-scanner-dialog',
  imports: [
    ReactiveFormsModule,
    SubmissionProblem,
    MatDialogTitle,
    MatDialogContent,
    MatDialogActions,
    MatDialogClose,
    MatButton,
    MatFormField,
    MatLabel,
    MatError,
    MatHint,
    MatInput,
    MatSelect,
    MatOption,
  ],
  templateUrl: './scanner-dialog.html',
  styleUrl: './scanner-dialog.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ScannerDialog {
  private readonly api = inject(ScannersApi);
  private readonly ref = inject<MatDialogRef<ScannerDialog, Scanner>>(MatDialogRef);
  protected readonly scanner = inject<Scanner | null>(MAT_DIALOG_DATA, { optional: true }) ?? null;
  private readonly fb = inject(NonNullableFormBuilder);

  protected readonly kinds = kindChoices;
  protected readonly kindLabel = kindLabel;
  protected readonly channels = channelNames;
  /** The input profile's two rows of one value per channel. */
  protected readonly channelRows = [
    {
      array: 'blackLevel',
      testId: 'black',
      step: 0.001,
      label: `Black level, as a fraction of full scale (0 to ${blackLevelMax})`,
    },
    {
      array: 'gains',
      testId: 'gain',
      step: 0.01,
      label: `Channel gains, from a scan of the bare light (above 0, at most ${gainMax})`,
    },
  ] as const;
  protected readonly gammaRange = gammaRange;

  private readonly channel = (value: number, min: number, max: number, minExclusive: boolean) =>
    this.fb.control(value as number | null, [
      Validators.required,
      minExclusive ? Validators.min(Number.MIN_VALUE) : Validators.min(min),
      Validators.max(max),
    ]);

  protected readonly form = this.fb.group({
    name: [this.scanner?.name ?? '', [Validators.required, Validators.maxLength(120)]],
    kind: [this.scanner?.kind ?? ('lab-scanner' as ScannerKind), [Validators.required]],
    inputProfile: this.fb.group({
      encoding: [this.scanner?.inputProfile.encoding ?? ('linear' as ScannerProfile['encoding'])],
      gamma: [
        (this.scanner?.inputProfile.gamma ?? 2.2) as number | null,
        [Validators.required, Validators.min(gammaRange.min), Validators.max(gammaRange.max)],
      ],
      blackLevel: this.fb.array(
        (this.scanner?.inputProfile.blackLevel ?? [0, 0, 0]).map((v) =>
          this.channel(v, 0, blackLevelMax, false),
        ),
      ),
      gains: this.fb.array(
        (this.scanner?.inputProfile.gains ?? [1, 1, 1]).map((v) => this.channel(v, 0, gainMax, true)),
      ),
    }),
  });
  protected readonly submission = new FormSubmission(this.form, (path) => {
    const field = bodyPath(path);
    // the profile's own name is the scanner's name, sent twice
    return this.form.get(field === 'inputProfile.name' ? 'name' : field);
  });
  protected readonly busy = this.submission.busy;
  protected readonly usesGamma = signal(this.form.controls.inputProfile.controls.encoding.value === 'gamma');

  constructor() {
    const { encoding, gamma } = this.form.controls.inputProfile.controls;
    const follow = (value: ScannerProfile['encoding']) => {
      this.usesGamma.set(value === 'gamma');
      // the gamma value only matters, and is only checked, for the pure gamma encoding
      if (value === 'gamma') gamma.enable({ emitEvent: false });
      else gamma.disable({ emitEvent: false });
    };
    follow(encoding.value);
    encoding.valueChanges.pipe(takeUntilDestroyed()).subscribe(follow);
  }

  /** The message a field shows under it; the server's own words win. */
  protected errorOf(path: string): string {
    return fieldErrorText(this.form.get(path)?.errors);
  }

  protected submit(): void {
    if (!this.submission.ready()) return;
    const v = this.form.getRawValue();
    const triple = (values: (number | null)[]) => values.map(Number) as [number, number, number];
    const request: CreateScannerRequest = {
      name: v.name.trim(),
      kind: v.kind,
      inputProfile: {
        name: v.name.trim(),
        encoding: v.inputProfile.encoding,
        // ignored by the other encodings; 1 keeps the stored profile honest about that
        gamma: v.inputProfile.encoding === 'gamma' ? Number(v.inputProfile.gamma) : 1,
        blackLevel: triple(v.inputProfile.blackLevel),
        gains: triple(v.inputProfile.gains),
      },
    };
    const call = this.scanner ? this.api.update(this.scanner.id, request) : this.api.create(request);
    this.submission.send(call, (scanner) => this.ref.close(scanner));
  }
}
