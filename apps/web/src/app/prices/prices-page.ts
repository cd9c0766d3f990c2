import { ChangeDetectionStrategy, Component, type OnInit, computed, inject, signal } from '@angular/core';
import { type FormArray, NonNullableFormBuilder, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButton, MatIconButton } from '@angular/material/button';
import { MatError, MatFormField, MatHint, MatLabel } from '@angular/material/form-field';
import { MatIcon } from '@angular/material/icon';
import { MatInput } from '@angular/material/input';
import { MatOption, MatSelect } from '@angular/material/select';
import type { FilmProcess, PriceList, ScanSize } from '@clearbase/contracts';
import { Session } from '../auth/session';
import { readProblem } from '../problem/read-problem';
import { showMoney, toMajor, toMinor } from './money';
import { PricesApi } from './prices-api';

// Keyed by the contract's types, so a process or size added there fails to compile here until it has a label.
const processLabels: Record<FilmProcess, string> = {
  'C-41': 'C-41',
  'E-6': 'E-6',
  'black-and-white': 'Black and white',
};
const scanSizeLabels: Record<ScanSize, string> = {
  standard: 'Standard',
  large: 'Large',
  full: 'Full resolution',
};

/** The price list: a table for everyone signed in; managers and admins edit it in place. */
@Component({
  selector: 'cb-prices-page',
  imports: [
    ReactiveFormsModule,
    MatButton,
    MatIconButton,
    MatIcon,
    MatFormField,
    MatLabel,
    MatError,
    MatHint,
    MatInput,
    MatSelect,
    MatOption,
  ],
  templateUrl: './prices-page.html',
  styleUrl: './prices-page.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class PricesPage implements OnInit {
  private readonly api = inject(PricesApi);
  private readonly fb = inject(NonNullableFormBuilder);
  private readonly role = inject(Session).role;

  protected readonly canEdit = computed(() => this.role() === 'manager' || this.role() === 'admin');
  protected readonly list = signal<PriceList | null>(null);
  protected readonly editing = signal(false);
  protected readonly busy = signal(false);
  protected readonly problem = signal<string | null>(null);
  protected readonly saved = signal(false);
  protected readonly processes = Object.keys(processLabels) as FilmProcess[];
  protected readonly processLabels = processLabels;
  protected readonly scanSizes = Object.keys(scanSizeLabels) as ScanSize[];
  protected readonly scanSizeLabels = scanSizeLabels;
  protected readonly showMoney = showMoney;

  protected readonly form = this.fb.group({
    currency: ['EUR', [Validators.required, Validators.pattern(/^[A-Z]{3}$/)]],
    pushPullPerStop: [0, [Validators.required, Validators.min(0)]],
    returnByPost: [0, [Validators.required, Validators.min(0)]],
    develop: this.fb.array([this.developRow()]),
    scan: this.fb.array([this.scanRow()]),
  });

  ngOnInit(): void {
    this.api.get().subscribe({
      next: (list) => this.list.set(list),
      error: (err: unknown) => this.problem.set(readProblem(err).message),
    });
  }

  protected get developRows(): FormArray<ReturnType<PricesPage['developRow']>> {
    return this.form.controls.develop;
  }

  protected get scanRows(): FormArray<ReturnType<PricesPage['scanRow']>> {
    return this.form.controls.scan;
  }

  private developRow(format = '', process: FilmProcess = 'C-41', amount = 0) {
    return this.fb.group({
      format: [format, [Validators.required, Validators.maxLength(40)]],
      process: [process, Validators.required],
      amount: [amount, [Validators.required, Validators.min(0)]],
    });
  }

  private scanRow(size: ScanSize = 'standard', amount = 0) {
    return this.fb.group({
      size: [size, Validators.required],
      amount: [amount, [Validators.required, Validators.min(0)]],
    });
  }

  protected edit(): void {
    const list = this.list();
    if (!list) return;
    const c = list.currency;
    this.form.controls.currency.setValue(c);
    this.form.controls.pushPullPerStop.setValue(toMajor(list.pushPullPerStopMinor, c));
    this.form.controls.returnByPost.setValue(toMajor(list.returnByPostMinor, c));
    this.developRows.clear();
    for (const d of list.develop)
      this.developRows.push(this.developRow(d.format, d.process, toMajor(d.amountMinor, c)));
    this.scanRows.clear();
    for (const s of list.scan) this.scanRows.push(this.scanRow(s.size, toMajor(s.amountMinor, c)));
    this.saved.set(false);
    this.editing.set(true);
  }

  protected addDevelop(): void {
    this.developRows.push(this.developRow());
  }

  protected addScan(): void {
    this.scanRows.push(this.scanRow());
  }

  protected save(): void {
    this.form.markAllAsTouched();
    if (this.form.invalid || this.busy()) return;
    const v = this.form.getRawValue();
    const list: PriceList = {
      currency: v.currency,
      pushPullPerStopMinor: toMinor(v.pushPullPerStop, v.currency),
      returnByPostMinor: toMinor(v.returnByPost, v.currency),
      develop: v.develop.map((d) => ({
        format: d.format.trim(),
        process: d.process,
        amountMinor: toMinor(d.amount, v.currency),
      })),
      scan: v.scan.map((s) => ({ size: s.size, amountMinor: toMinor(s.amount, v.currency) })),
    };
    this.busy.set(true);
    this.problem.set(null);
    this.api.save(list).subscribe({
      next: (savedList) => {
        this.busy.set(false);
        this.list.set(savedList);
        this.editing.set(false);
        this.saved.set(true);
      },
      error: (err: unknown) => {
        this.busy.set(false);
        const p = readProblem(err);
        const fields = Object.entries(p.fieldErrors).map(
          ([path, msg]) => `${path.replace(/^body\./, '')}: ${msg}`,
        );
        this.problem.set([p.message, ...fields].join(' '));
      },
    });
  }
}
