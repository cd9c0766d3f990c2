import {
  ChangeDetectionStrategy,
  Component,
  computed,
  DestroyRef,
  inject,
  signal,
  viewChild,
} from '@angular/core';
import { takeUntilDestroyed, toSignal } from '@angular/core/rxjs-interop';
import {
  type AbstractControl,
  type FormGroup,
  NonNullableFormBuilder,
  ReactiveFormsModule,
  type ValidationErrors,
  Validators,
} from '@angular/forms';
import { MatAutocomplete, MatAutocompleteTrigger } from '@angular/material/autocomplete';
import { MatButton } from '@angular/material/button';
import { MatDialog } from '@angular/material/dialog';
import { MatError, MatFormField, MatHint, MatLabel } from '@angular/material/form-field';
import { MatIcon } from '@angular/material/icon';
import { MatInput } from '@angular/material/input';
import { MatProgressBar } from '@angular/material/progress-bar';
import { MatRadioButton, MatRadioGroup } from '@angular/material/radio';
import { MatOption, MatSelect } from '@angular/material/select';
import { STEPPER_GLOBAL_OPTIONS, type StepperSelectionEvent } from '@angular/cdk/stepper';
import {
  MatStep,
  MatStepLabel,
  MatStepper,
  MatStepperNext,
  MatStepperPrevious,
} from '@angular/material/stepper';
import { Router, RouterLink } from '@angular/router';
import type {
  CreateOrderRequest,
  NegativesReturn,
  Order,
  OrderCustomer,
  OrderDraft,
  OutputFormat,
  Quote,
  ScanSize,
  Stock,
} from '@clearbase/contracts';
import { catchError, map, of, startWith, Subject, switchMap } from 'rxjs';
import { Session } from '../auth/session';
import { CatalogueApi } from '../catalogue/catalogue-api';
import { processLabel } from '../catalogue/stock-labels';
import { bodyPath } from '../forms/apply-field-problems';
import { fieldErrorText } from '../forms/field-error-text';
import { FormSubmission } from '../forms/form-submission';
import { BrowserLocation } from '../prices/browser-location';
import { showMoney } from '../prices/money';
import { PaymentsApi } from '../prices/payments-api';
import { PricesApi } from '../prices/prices-api';
import { readProblem } from '../problem/read-problem';
import { pushPullLabel } from '../rolls/roll-labels';
import {
  commonFrameFormats,
  isStaffRole,
  negativesLabel,
  outputFormatLabel,
  scanSizeLabel,
} from './order-labels';
import { OrdersApi } from './orders-api';
import { StockSheetViewDialog } from './stock-sheet-view-dialog';
import {
  eiRange,
  pushPullChoices,
  notesMaxLength,
  outputFormats,
  scanSizes,
} from '@clearbase/contracts/values';

const scanSizeChoices: readonly ScanSize[] = scanSizes;
const outputFormatChoices: readonly OutputFormat[] = outputFormats;

/** Which step's form holds each top-level field of the request body, so a server complaint finds its control. */
const stepOfField: Readonly<Record<string, string>> = {
  customerId: 'customer',
  rolls: 'rolls',
  scanSize: 'scans',
  outputFormats: 'scans',
  negatives: 'delivery',
  notes: 'notes',
};

const atLeastOne = (control: AbstractControl): ValidationErrors | null =>
  (control.value as unknown[]).length ? null : { required: true };

interface QuoteView {
  loading: boolean;
  quote: Quote | null;
  problem: string | null;
}

/**
 * Placing an order, step by step: the rolls (stock, EI, push/pull, format), the scans wanted, what happens to the
 * negatives, notes, then a review with the lab's price before paying. Staff placing an order first choose whose it is.
 * The order and its rolls go to the server in one request; its complaints land on the step and field they name.
 */
@Component({
  selector: 'cb-new-order-page',
  imports: [
    ReactiveFormsModule,
    RouterLink,
    MatStepper,
    MatStep,
    MatStepLabel,
    MatStepperNext,
    MatStepperPrevious,
    MatFormField,
    MatLabel,
    MatError,
    MatHint,
    MatInput,
    MatSelect,
    MatOption,
    MatAutocomplete,
    MatAutocompleteTrigger,
    MatRadioGroup,
    MatRadioButton,
    MatButton,
    MatIcon,
    MatProgressBar,
  ],
  // a step with a field to change shows so in its header
  providers: [{ provide: STEPPER_GLOBAL_OPTIONS, useValue: { showError: true } }],
  templateUrl: './new-order-page.html',
  styleUrl: './new-order-page.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class NewOrderPage {
  private readonly fb = inject(NonNullableFormBuilder);
  private readonly ordersApi = inject(OrdersApi);
  private readonly pricesApi = inject(PricesApi);
  private readonly paymentsApi = inject(PaymentsApi);
  private readonly dialog = inject(MatDialog);
  private readonly router = inject(Router);
  private readonly location = inject(BrowserLocation);
  private readonly destroyRef = inject(DestroyRef);

  protected readonly staff = isStaffRole(inject(Session).role());
  protected readonly eiRange = eiRange;
  protected readonly pushPullChoices = pushPullChoices;
  protected readonly pushPullLabel = pushPullLabel;
  protected readonly scanSizeChoices = scanSizeChoices;
  protected readonly scanSizeLabel = scanSizeLabel;
  protected readonly outputFormatChoices = outputFormatChoices;
  protected readonly outputFormatLabel = outputFormatLabel;
  protected readonly processLabel = processLabel;
  protected readonly showMoney = showMoney;
  protected readonly notesMaxLength = notesMaxLength;

  private readonly stepper = viewChild(MatStepper);

  protected readonly stocks = toSignal(
    inject(CatalogueApi)
      .stocks({ q: '', process: '', masking: '' })
      .pipe(catchError(() => of<Stock[]>([]))),
    { initialValue: [] as Stock[] },
  );
  protected readonly customers = toSignal(
    this.staff ? this.ordersApi.customers().pipe(catchError(() => of<OrderCustomer[]>([]))) : of([]),
    { initialValue: [] as OrderCustomer[] },
  );

  protected readonly form = this.fb.group({
    customer: this.fb.group({
      customerId: this.fb.control<number | null>({ value: null, disabled: !this.staff }, Validators.required),
    }),
    rolls: this.fb.group({
      rolls: this.fb.array([this.rollGroup()], Validators.required),
    }),
    scans: this.fb.group({
      scanSize: this.fb.control<ScanSize>('standard', Validators.required),
      outputFormats: this.fb.control<OutputFormat[]>(['jpeg'], atLeastOne),
    }),
    delivery: this.fb.group({
      negatives: this.fb.group({
        method: this.fb.control<NegativesReturn['method']>('collect'),
        address: this.fb.group({
          name: this.fb.control('', [Validators.required, Validators.maxLength(120)]),
          line1: this.fb.control('', [Validators.required, Validators.maxLength(200)]),
          line2: this.fb.control('', Validators.maxLength(200)),
          town: this.fb.control('', [Validators.required, Validators.maxLength(120)]),
          postcode: this.fb.control('', Validators.maxLength(20)),
          country: this.fb.control('', [Validators.required, Validators.maxLength(80)]),
        }),
      }),
    }),
    notes: this.fb.group({
      notes: this.fb.control('', Validators.maxLength(notesMaxLength)),
    }),
  });
  protected readonly rollsArray = this.form.controls.rolls.controls.rolls;
  private readonly negatives = this.form.controls.delivery.controls.negatives;
  protected readonly postBack = toSignal(
    this.negatives.controls.method.valueChanges.pipe(map((m) => m === 'post')),
    { initialValue: false },
  );

  private readonly submission = new FormSubmission(this.form, (path) => this.controlFor(path));
  protected readonly busy = this.submission.busy;
  protected readonly problem = this.submission.problem;
  protected readonly unclaimed = this.submission.unclaimed;
  /** True once the order is placed and the page is on its way to the payment. */
  protected readonly leaving = signal(false);

  private readonly quoteRequests = new Subject<OrderDraft>();
  private readonly quoteView = toSignal(
    this.quoteRequests.pipe(
      switchMap((draft) =>
        this.pricesApi.quote(draft).pipe(
          map((quote): QuoteView => ({ loading: false, quote, problem: null })),
          catchError((err: unknown) =>
            of<QuoteView>({ loading: false, quote: null, problem: readProblem(err).message }),
          ),
          startWith<QuoteView>({ loading: true, quote: null, problem: null }),
        ),
      ),
    ),
    { initialValue: { loading: false, quote: null, problem: null } satisfies QuoteView },
  );
  protected readonly quote = computed(() => this.quoteView().quote);
  protected readonly quoteLoading = computed(() => this.quoteView().loading);
  protected readonly quoteProblem = computed(() => this.quoteView().problem);

  constructor() {
    this.negatives.controls.address.disable();
    this.negatives.controls.method.valueChanges.pipe(takeUntilDestroyed()).subscribe((method) => {
      const address = this.negatives.controls.address;
      if (method === 'post') address.enable();
      else address.disable();
    });
  }

  /** One roll's controls; choosing a stock fills its box speed and first frame format unless typed already. */
  private rollGroup() {
    const group = this.fb.group({
      stockId: this.fb.control<number | null>(null, Validators.required),
      ei: this.fb.control<number | null>(null, [
        Validators.required,
        Validators.min(eiRange.min),
        Validators.max(eiRange.max),
        Validators.pattern(/^\d+$/),
      ]),
      pushPull: this.fb.control<number>(0),
      format: this.fb.control('', [Validators.required, Validators.maxLength(40)]),
    });
    group.controls.stockId.valueChanges.pipe(takeUntilDestroyed(this.destroyRef)).subscribe((id) => {
      const stock = this.stocks().find((s) => s.id === id);
      if (!stock) return;
      const { ei, format } = group.controls;
      if (!ei.dirty) ei.setValue(stock.iso);
      if (!format.dirty && stock.frameFormats[0]) format.setValue(stock.frameFormats[0]);
    });
    return group;
  }

  protected addRoll(): void {
    this.rollsArray.push(this.rollGroup());
  }

  protected removeRoll(index: number): void {
    this.rollsArray.removeAt(index);
  }

  protected stockOf(roll: FormGroup): Stock | null {
    const id = roll.get('stockId')?.value as number | null;
    return this.stocks().find((s) => s.id === id) ?? null;
  }

  protected customerName(): string {
    const id = this.form.controls.customer.controls.customerId.value;
    return this.customers().find((c) => c.id === id)?.name ?? '';
  }

  /** Frame formats to suggest for what is typed so far. */
  protected formatSuggestions(typed: string): readonly string[] {
    const text = typed.trim().toLowerCase();
    return text ? commonFrameFormats.filter((f) => f.toLowerCase().includes(text)) : commonFrameFormats;
  }

  protected openSheet(stock: Stock): void {
    this.dialog.open(StockSheetViewDialog, { data: stock, width: '640px', autoFocus: 'dialog' });
  }

  protected errorOf(control: AbstractControl | null): string {
    return fieldErrorText(control?.errors, { pattern: 'A whole number' });
  }

  protected formatsError(): string {
    const control = this.form.controls.scans.controls.outputFormats;
    return control.errors?.['required'] ? 'Choose at least one file format' : this.errorOf(control);
  }

  /** The review step prices what is asked for with the lab's price list each time it is opened. */
  protected stepChanged(event: StepperSelectionEvent): void {
    const last = (this.stepper()?.steps.length ?? 0) - 1;
    if (event.selectedIndex === last) this.quoteRequests.next(this.draft());
  }

  private draft(): OrderDraft {
    const v = this.form.getRawValue();
    return {
      scanSize: v.scans.scanSize,
      rolls: v.rolls.rolls.map((r) => ({
        format: r.format.trim(),
        process: this.stocks().find((s) => s.id === r.stockId)?.process ?? 'C-41',
        pushPull: r.pushPull,
      })),
      negatives: v.delivery.negatives.method,
    };
  }

  private request(): CreateOrderRequest {
    const v = this.form.getRawValue();
    const address = v.delivery.negatives.address;
    return {
      ...(this.staff ? { customerId: Number(v.customer.customerId) } : {}),
      notes: v.notes.notes.trim(),
      outputFormats: v.scans.outputFormats,
      scanSize: v.scans.scanSize,
      negatives:
        v.delivery.negatives.method === 'post'
          ? {
              method: 'post',
              address: {
                name: address.name.trim(),
                line1: address.line1.trim(),
                line2: address.line2.trim(),
                town: address.town.trim(),
                postcode: address.postcode.trim(),
                country: address.country.trim(),
              },
            }
          : { method: 'collect' },
      rolls: v.rolls.rolls.map((r) => ({
        stockId: Number(r.stockId),
        ei: Number(r.ei),
        pushPull: r.pushPull,
        format: r.format.trim(),
        scannerId: null,
      })),
    };
  }

  /** The control a server complaint names: `body.rolls.1.ei` is the EI of the second roll on the rolls step. */
  private controlFor(path: string): AbstractControl | null {
    const field = bodyPath(path);
    const step = stepOfField[field.split('.')[0] ?? ''];
    return step ? this.form.get(`${step}.${field}`) : null;
  }

  protected place(): void {
    if (!this.submission.ready()) {
      this.showFirstProblem();
      return;
    }
    this.submission.send(
      this.ordersApi.place(this.request()),
      (order) => this.pay(order),
      () => this.showFirstProblem(),
    );
  }

  /** Moves the stepper back to the first step holding a field that needs changing. */
  private showFirstProblem(): void {
    const stepper = this.stepper();
    if (!stepper) return;
    const index = stepper.steps.toArray().findIndex((step) => step.stepControl?.invalid);
    if (index >= 0) stepper.selectedIndex = index;
  }

  /** A customer goes on to the provider's payment page; staff, who do not pay, to the order. */
  private pay(order: Order): void {
    this.leaving.set(true);
    if (this.staff) {
      void this.router.navigate(['/orders', order.id]);
      return;
    }
    this.paymentsApi.checkout(order.id).subscribe({
      next: (res) => this.location.assign(res.checkoutUrl),
      // the order is placed: its page offers the payment again
      error: () => void this.router.navigate(['/orders', order.id]),
    });
  }

  protected reviewRolls() {
    return this.form.getRawValue().rolls.rolls.map((r) => ({
      stock: this.stocks().find((s) => s.id === r.stockId)?.name ?? '',
      ei: r.ei,
      pushPull: r.pushPull,
      format: r.format.trim(),
    }));
  }

  protected reviewNegatives(): string {
    return negativesLabel(this.request().negatives);
  }
}
