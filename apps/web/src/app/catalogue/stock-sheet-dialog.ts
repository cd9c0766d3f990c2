import { ChangeDetectionStrategy, Component, inject } from '@angular/core';
import { NonNullableFormBuilder, ReactiveFormsModule } from '@angular/forms';
import { MatButton } from '@angular/material/button';
import {
  MAT_DIALOG_DATA,
  MatDialogActions,
  MatDialogClose,
  MatDialogContent,
  MatDialogRef,
  MatDialogTitle,
} from '@angular/material/dialog';
import { MatError, MatFormField, MatLabel } from '@angular/material/form-field';
import { MatInput } from '@angular/material/input';
import type { Stock, UpdateStockSheetRequest } from '@clearbase/contracts';
import { FormSubmission } from '../forms/form-submission';
import { SubmissionProblem } from '../forms/submission-problem';
import { CatalogueApi } from './catalogue-api';
import { StockSheetFields } from './stock-sheet-fields';
import { stockSheetControls, stockSheetRequest } from './stock-sheet-form';
import { stockFieldError } from './stock-limits';

/** Manager: changes what a stock's sheet says; closes with the saved stock. */
@Component({
  selector: 'cb-stock-sheet-dialog',
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
    MatInput,
    StockSheetFields,
  ],
  templateUrl: './stock-sheet-dialog.html',
  styleUrl: './new-stock-dialog.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class StockSheetDialog {
  private readonly api = inject(CatalogueApi);
  private readonly ref = inject<MatDialogRef<StockSheetDialog, Stock>>(MatDialogRef);
  protected readonly stock = inject<Stock>(MAT_DIALOG_DATA);
  private readonly fb = inject(NonNullableFormBuilder);

  protected readonly form = this.fb.group(stockSheetControls(this.fb, this.stock));
  protected readonly submission = new FormSubmission(this.form);
  protected readonly busy = this.submission.busy;

  protected errorOf(name: string): string {
    return stockFieldError(this.form.get(name)?.errors);
  }

  protected submit(): void {
    if (!this.submission.ready()) return;
    const sheet: UpdateStockSheetRequest = stockSheetRequest(this.form.getRawValue());
    this.submission.send(this.api.updateSheet(this.stock.id, sheet), (stock) => this.ref.close(stock));
  }
}
