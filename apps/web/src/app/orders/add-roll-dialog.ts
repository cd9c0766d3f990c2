import { ChangeDetectionStrategy, Component, computed, inject } from '@angular/core';
import { takeUntilDestroyed, toSignal } from '@angular/core/rxjs-interop';
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
import type { CreateRollRequest, Roll, Scanner, Stock } from '@clearbase/contracts';
import { catchError, of } from 'rxjs';
import { CatalogueApi } from '../catalogue/catalogue-api';
import { applyFieldProblems, bodyPath } from '../forms/apply-field-problems';
import { fieldErrorText } from '../forms/field-error-text';
import { FormSubmission } from '../forms/form-submission';
import { pushPullLabel } from '../rolls/roll-labels';
import { ScannersApi } from '../scanners/scanners-api';
import { OrdersApi } from './orders-api';
import { eiRange, pushPullChoices } from '@clearbase/contracts/values';

/** What the dialog needs: the order the roll goes on. */
export interface AddRollData {
  orderId: number;
}

/** Lab staff add a roll to an order: its stock, the EI it was shot at, push/pull, frame format, scanner. */
@Component({
  selector: 'cb-add-roll-dialog',
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
    MatInput,
    MatSelect,
    MatOption,
  ],
  templateUrl: './add-roll-dialog.html',
  styleUrl: './add-roll-dialog.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class AddRollDialog {
  private readonly api = inject(OrdersApi);
  private readonly ref = inject<MatDialogRef<AddRollDialog, Roll>>(MatDialogRef);
  private readonly data = inject<AddRollData>(MAT_DIALOG_DATA);
  private readonly fb = inject(NonNullableFormBuilder);

  protected readonly pushPullChoices = pushPullChoices;
  protected readonly pushPullLabel = pushPullLabel;
  protected readonly eiRange = eiRange;

  protected readonly stocks = toSignal(
    inject(CatalogueApi)
      .stocks({ q: '', process: '', masking: '' })
      .pipe(catchError(() => of<Stock[]>([]))),
    { initialValue: [] as Stock[] },
  );
  protected readonly scanners = toSignal(
    inject(ScannersApi)
      .list()
      .pipe(catchError(() => of<Scanner[]>([]))),
    { initialValue: [] as Scanner[] },
  );

  protected readonly form = this.fb.group({
    stockId: this.fb.control<number | null>(null, Validators.required),
    ei: this.fb.control<number | null>(null, [
      Validators.required,
      Validators.min(eiRange.min),
      Validators.max(eiRange.max),
      Validators.pattern(/^\d+$/),
    ]),
    pushPull: this.fb.control<number>(0),
    format: this.fb.control('', [Validators.required, Validators.maxLength(40)]),
    scannerId: this.fb.control<number | null>(null),
  });
  private readonly stockId = toSignal(this.form.controls.stockId.valueChanges, { initialValue: null });
  protected readonly stock = computed(() => this.stocks().find((s) => s.id === this.stockId()) ?? null);
  private readonly submission = new FormSubmission(this.form, (path) => this.form.get(bodyPath(path)));
  protected readonly busy = this.submission.busy;
  protected readonly problem = this.submission.problem;
  protected readonly unclaimed = this.submission.unclaimed;

  constructor() {
    // a stock suggests its own EI and frame format; what the operator typed is kept
    this.form.controls.stockId.valueChanges.pipe(takeUntilDestroyed()).subscribe((id) => {
      const stock = this.stocks().find((s) => s.id === id);
      if (!stock) return;
      const { ei, format } = this.form.controls;
      if (!ei.dirty) ei.setValue(stock.recommendedEi ?? stock.iso);
      if (!format.dirty && stock.frameFormats[0]) format.setValue(stock.frameFormats[0]);
    });
  }

  protected errorOf(name: string): string {
    return fieldErrorText(this.form.get(name)?.errors, { pattern: 'A whole number' });
  }

  protected submit(): void {
    if (!this.submission.ready()) return;
    const v = this.form.getRawValue();
    const request: CreateRollRequest = {
      stockId: Number(v.stockId),
      ei: Number(v.ei),
      pushPull: v.pushPull,
      format: v.format.trim(),
      scannerId: v.scannerId,
    };
    this.submission.send(
      this.api.addRoll(this.data.orderId, request),
      (roll) => this.ref.close(roll),
      (p) => {
        // a stock with no published profile is refused without a field path: it is the stock's fault
        if (p.status === 422 && Object.keys(p.fieldErrors).length === 0) {
          applyFieldProblems({ stockId: p.message }, (path) => this.form.get(path));
        }
      },
    );
  }
}
