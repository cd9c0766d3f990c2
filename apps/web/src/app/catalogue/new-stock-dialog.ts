import { ChangeDetectionStrategy, Component, inject, signal } from '@angular/core';
import { NonNullableFormBuilder, ReactiveFormsModule, type ValidatorFn, Validators } from '@angular/forms';
import { MatButton } from '@angular/material/button';
import {
  MatDialogActions,
  MatDialogClose,
  MatDialogContent,
  MatDialogRef,
  MatDialogTitle,
} from '@angular/material/dialog';
import { MatError, MatFormField, MatHint, MatLabel, MatSuffix } from '@angular/material/form-field';
import { MatInput } from '@angular/material/input';
import { MatOption, MatSelect } from '@angular/material/select';
import type { CreateStockRequest, FilmProcess, Stock } from '@clearbase/contracts';
import { readProblem } from '../problem/read-problem';
import { applyFieldProblems, bodyField } from './apply-field-problems';
import { CatalogueApi } from './catalogue-api';
import { processChoices, processLabel } from './stock-labels';

// The server's limits (libs/contracts stocks/stock.ts), written out to keep zod out of the browser bundle:
// speeds 6 to 25600, latitude 0 to 10 stops, p from 1 to 2 (common practice of the trade, from memory).
const speedRange = { min: 6, max: 25600 } as const;
const latitudeRange = { min: 0, max: 10 } as const;
const reciprocityExponentRange = { min: 1, max: 2 } as const;
// p = 1.3 suits many films: common practice of the trade, from memory (the server's default too)
const defaultReciprocityExponent = 1.3;

/** A whole number, or nothing entered. */
const wholeNumber: ValidatorFn = (c) =>
  c.value === null || c.value === '' || Number.isInteger(Number(c.value)) ? null : { wholeNumber: true };

/** Manager: adds a stock with its sheet; the server's complaints appear under the fields they concern. */
@Component({
  selector: 'cb-new-stock-dialog',
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
    MatSelect,
    MatOption,
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
  protected readonly latitudeRange = latitudeRange;
  protected readonly exponentRange = reciprocityExponentRange;
  protected readonly form = inject(NonNullableFormBuilder).group({
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
    notes: ['', [Validators.maxLength(4000)]],
    recommendedEi: [
      null as number | null,
      [Validators.min(speedRange.min), Validators.max(speedRange.max), wholeNumber],
    ],
    latitudeUnderStops: [
      null as number | null,
      [Validators.min(latitudeRange.min), Validators.max(latitudeRange.max)],
    ],
    latitudeOverStops: [
      null as number | null,
      [Validators.min(latitudeRange.min), Validators.max(latitudeRange.max)],
    ],
    pushPullNotes: ['', [Validators.maxLength(4000)]],
    reciprocityExponent: [
      defaultReciprocityExponent as number | null,
      [
        Validators.required,
        Validators.min(reciprocityExponentRange.min),
        Validators.max(reciprocityExponentRange.max),
      ],
    ],
    handlingNotes: ['', [Validators.maxLength(4000)]],
  });
  protected readonly busy = signal(false);
  protected readonly problem = signal<string | null>(null);
  protected readonly unclaimed = signal<string[]>([]);

  /** The message a field shows under it, its first complaint first; the server's own words win. */
  protected errorOf(name: string): string {
    const e = this.form.get(name)?.errors;
    if (!e) return '';
    if (e['server']) return String(e['server']);
    if (e['required']) return 'Required';
    if (e['min']) return `At least ${(e['min'] as { min: number }).min}`;
    if (e['max']) return `At most ${(e['max'] as { max: number }).max}`;
    if (e['wholeNumber']) return 'A whole number';
    if (e['maxlength'])
      return `At most ${(e['maxlength'] as { requiredLength: number }).requiredLength} characters`;
    if (e['pattern']) return 'List at least one format, separated by commas';
    return 'Check this value';
  }

  protected submit(): void {
    this.form.markAllAsTouched();
    if (this.form.invalid || this.busy()) return;
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
      notes: v.notes.trim(),
      recommendedEi: v.recommendedEi ?? null,
      latitudeUnderStops: v.latitudeUnderStops ?? null,
      latitudeOverStops: v.latitudeOverStops ?? null,
      pushPullNotes: v.pushPullNotes.trim(),
      reciprocityExponent: Number(v.reciprocityExponent),
      handlingNotes: v.handlingNotes.trim(),
    };
    this.busy.set(true);
    this.problem.set(null);
    this.unclaimed.set([]);
    this.api.createStock(request).subscribe({
      next: (stock) => {
        this.busy.set(false);
        this.ref.close(stock);
      },
      error: (err: unknown) => {
        this.busy.set(false);
        const p = readProblem(err);
        this.problem.set(p.message);
        this.unclaimed.set(applyFieldProblems(p.fieldErrors, (path) => this.form.get(bodyField(path))));
      },
    });
  }
}
