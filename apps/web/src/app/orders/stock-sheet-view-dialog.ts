import { ChangeDetectionStrategy, Component, inject } from '@angular/core';
import { MatButton } from '@angular/material/button';
import {
  MAT_DIALOG_DATA,
  MatDialogActions,
  MatDialogClose,
  MatDialogContent,
  MatDialogTitle,
} from '@angular/material/dialog';
import type { Stock } from '@clearbase/contracts';
import { StockSheet } from '../catalogue/stock-sheet';

/** A stock's sheet read while ordering, without leaving the order form. Open it with the stock as its data. */
@Component({
  selector: 'cb-stock-sheet-view-dialog',
  imports: [MatDialogTitle, MatDialogContent, MatDialogActions, MatDialogClose, MatButton, StockSheet],
  template: `
    <h2 mat-dialog-title>{{ stock.name }}</h2>
    <mat-dialog-content data-testid="stock-sheet-view">
      <cb-stock-sheet [stock]="stock" />
    </mat-dialog-content>
    <mat-dialog-actions align="end">
      <button mat-flat-button type="button" mat-dialog-close data-testid="stock-sheet-view-close">
        Close
      </button>
    </mat-dialog-actions>
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class StockSheetViewDialog {
  protected readonly stock = inject<Stock>(MAT_DIALOG_DATA);
}
