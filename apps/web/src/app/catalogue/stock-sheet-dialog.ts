import { ChangeDetectionStrategy, Component, inject } from '@angular/core';
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
import { MatError, MatFormField, MatHint, MatLabel, MatSuffix } from '@angular/material/form-field';
import { MatInput } from '@angular/material/input';
import type { Stock, UpdateStockSheetRequest } from '@clearbase/contracts';
import { FormSubmission } from '../forms/form-submission';
import { CatalogueApi } from './catalogue-api';
import {
  latitudeRange,
  noteMaxLength,
  reciprocityExponentRange,
  speedRange,
  stockFieldError,
  wholeNumber,
} from './stock-limits';

/** Manager: changes what a stock's sheet says; closes with the saved stock. */
@Component({
  selector: 'cb-stock-sheet-dialog',
  imports: [
    ReactiveFormsModule,
    MatDialogTitle,
    MatDialogContent,
    MatDialogActions,
    MatDialogClose,
    MatButton,
    MatFormField,
    MatLabel,
    MatError,
    MatHint,
    MatSuffix,
    MatInput,
  ],
  templateUrl: './stock-sheet-dialog.html',
  styleUrl: './new-stock-dialog.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class StockSheetDialog {
  private readonly api = inject(CatalogueApi);
  private readonly ref = inject<MatDialogRef<StockSheetDialog, Stock>>(MatDialogRef);
  protected readonly stock = inject<Stock>(MAT_DIALOG_DATA);

  protected readonly exponentRange = reciprocityExponentRange;
  protected readonly form = inject(NonNullableFormBuilder).group({
    notes: [this.stock.notes, [Validators.maxLength(noteMaxLength)]],
    recommendedEi: [
      this.stock.recommendedEi,
      [Validators.min(speedRange.min), Validators.max(speedRange.max), wholeNumber],
    ],
    latitudeUnderStops: [
      this.stock.latitudeUnderStops,
      [Validators.min(latitudeRange.min), Validators.max(latitudeRange.max)],
    ],
    latitudeOverStops: [
      this.stock.latitudeOverStops,
      [Validators.min(latitudeRange.min), Validators.max(latitudeRange.max)],
    ],
    pushPullNotes: [this.stock.pushPullNotes, [Validators.maxLength(noteMaxLength)]],
    reciprocityExponent: [
      this.stock.reciprocityExponent as number | null,
      [
        Validators.required,
        Validators.min(reciprocityExponentRange.min),
        Validators.max(reciprocityExponentRange.max),
      ],
    ],
    handlingNotes: [this.stock.handlingNotes, [Validators.maxLength(noteMaxLength)]],
  });
  private readonly submission = new FormSubmission(this.form);
  protected readonly busy = this.submission.busy;
  protected readonly problem = this.submission.problem;
  protected readonly unclaimed = this.submission.unclaimed;

  protected errorOf(name: string): string {
    return stockFieldError(this.form.get(name)?.errors);
  }

  protected submit(): void {
    if (!this.submission.ready()) return;
    const v = this.form.getRawValue();
    const sheet: UpdateStockSheetRequest = {
      notes: v.notes.trim(),
      recommendedEi: v.recommendedEi ?? null,
      latitudeUnderStops: v.latitudeUnderStops ?? null,
      latitudeOverStops: v.latitudeOverStops ?? null,
      pushPullNotes: v.pushPullNotes.trim(),
      reciprocityExponent: Number(v.reciprocityExponent),
      handlingNotes: v.handlingNotes.trim(),
    };
    this.submission.send(this.api.updateSheet(this.stock.id, sheet), (stock) => this.ref.close(stock));
  }
}
