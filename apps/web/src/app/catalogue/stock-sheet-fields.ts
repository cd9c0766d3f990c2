import {
  ChangeDetectionStrategy,
  ChangeDetectorRef,
  Component,
  DestroyRef,
  inject,
  input,
  type OnInit,
} from '@angular/core';
import { takeUntilDestroyed } from '@angular/core/rxjs-interop';
import { ControlContainer, FormGroupDirective, ReactiveFormsModule } from '@angular/forms';
import { MatError, MatFormField, MatHint, MatLabel, MatSuffix } from '@angular/material/form-field';
import { MatInput } from '@angular/material/input';
import { reciprocityExponentRange, stockFieldError } from './stock-limits';

/**
 * The fields of a stock's sheet — recommended EI, reciprocity exponent, latitude, push and pull, handling — bound
 * to the controls of the enclosing `[formGroup]` made with `stockSheetControls`. Notes stay with the dialog, which
 * places them where it wants them.
 *
 * @example
 * <cb-stock-sheet-fields testIdPrefix="sheet-dialog" [boxSpeed]="stock.iso" />
 */
@Component({
  selector: 'cb-stock-sheet-fields',
  imports: [ReactiveFormsModule, MatFormField, MatLabel, MatError, MatHint, MatSuffix, MatInput],
  templateUrl: './stock-sheet-fields.html',
  styleUrls: ['./new-stock-dialog.scss', './stock-sheet-fields.scss'],
  changeDetection: ChangeDetectionStrategy.OnPush,
  // the fields join the dialog's own form rather than one of their own
  viewProviders: [{ provide: ControlContainer, useExisting: FormGroupDirective }],
})
export class StockSheetFields implements OnInit {
  private readonly container = inject(ControlContainer);
  private readonly changes = inject(ChangeDetectorRef);
  private readonly destroyRef = inject(DestroyRef);

  /** Starts the fields' test ids, as in `new-stock-ei` or `sheet-dialog-ei`. */
  readonly testIdPrefix = input.required<string>();
  /** The stock's box speed, named in the EI hint when known. */
  readonly boxSpeed = input<number | null>(null);

  protected readonly exponentRange = reciprocityExponentRange;

  ngOnInit(): void {
    // the dialog's submit and the server's complaints change the fields' state from outside this view
    this.container.control?.events
      .pipe(takeUntilDestroyed(this.destroyRef))
      .subscribe(() => this.changes.markForCheck());
  }

  /** The message a field shows under it. */
  protected errorOf(name: string): string {
    return stockFieldError(this.container.control?.get(name)?.errors);
  }
}
