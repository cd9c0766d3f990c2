import { ChangeDetectionStrategy, Component, inject } from '@angular/core';
import { NonNullableFormBuilder, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButton } from '@angular/material/button';
import {
  MatDialogActions,
  MatDialogClose,
  MatDialogContent,
  MatDialogRef,
  MatDialogTitle,
} from '@angular/material/dialog';
import { MatError, MatFormField, MatHint, MatLabel } from '@angular/material/form-field';
import { MatInput } from '@angular/material/input';
import { MatOption, MatSelect } from '@angular/material/select';
import type { CreateStockRequest, FilmProcess, Stock } from '@clearbase/contracts';
import { FormSubmission } from '../forms/form-submission';
import { SubmissionProblem } from '../forms/submission-problem';
import { CatalogueApi } from './catalogue-api';
import { processChoices, processLabel } from './stock-labels';
import { StockSheetFields } from './stock-sheet-fields';
import { stockSheetControls, stockSheetRequest } from './stock-sheet-form';
import { defaultReciprocityExponent, speedRange, stockFieldError, wholeNumber } from './stock-limits';

/** Manager: adds a stock with its sheet; the server's complaints appear under the fields they concern. */
@Component({
  selector: 'cb-new-stock-dialog',
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
    StockSheetFields,
  ],
  templateUrl: './new-stock-dialog.html',
  styleUrl: './new-stock-dialog.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class NewStockDialog {
  private readonly api = inject(CatalogueApi);
  private readonly ref = inject<MatDialogRef<NewStockDialog, Stock>>(MatDialogRef);

  protected readonly processes = processChoices;
  protected readonly processLabel = processLabel;
  protected readonly speedRange = speedRange;
  private readonly fb = inject(NonNullableFormBuilder);
  protected readonly form = this.fb.group({
    name: ['', [Validators.required, Validators.maxLength(120)]],
    maker: ['', [Validators.required, Validators.maxLength(120)]],
    iso: [
      null as number | null,
      [Validators.required, Validators.min(speedRange.min), Validators.max(speedRange.max), wholeNumber],
    ],
    process: ['C-41' as FilmProcess, [Validators.required]],
    masked: [false, [Validators.required]],
    baseMaterial: ['', [Validators.required, Validators.maxLength(120)]],
    frameFormats: ['', [Validators.required, Validators.pattern(/[^,\s]/)]],
    ...stockSheetControls(this.fb, {
      notes: '',
      recommendedEi: null,
      latitudeUnderStops: null,
      latitudeOverStops: null,
      pushPullNotes: '',
      reciprocityExponent: defaultReciprocityExponent,
      handlingNotes: '',
    }),
  });
  protected readonly submission = new FormSubmission(this.form);
  protected readonly busy = this.submission.busy;

  /** The message a field shows under it. */
  protected errorOf(name: string): string {
    return stockFieldError(this.form.get(name)?.errors);
  }

  protected submit(): void {
    if (!this.submission.ready()) return;
    const v = this.form.getRawValue();
    const request: CreateStockRequest = {
      name: v.name.trim(),
      maker: v.maker.trim(),
      iso: Number(v.iso),
      process: v.process,
      masked: v.masked,
      baseMaterial: v.baseMaterial.trim(),
      frameFormats: v.frameFormats
        .split(',')
        .map((f) => f.trim())
        .filter((f) => f !== ''),
      ...stockSheetRequest(v),
    };
    this.submission.send(this.api.createStock(request), (stock) => this.ref.close(stock));
  }
}
