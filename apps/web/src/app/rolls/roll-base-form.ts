import { DecimalPipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, effect, inject, input, output, signal } from '@angular/core';
import { toSignal } from '@angular/core/rxjs-interop';
import { NonNullableFormBuilder, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButton } from '@angular/material/button';
import { MatButtonToggle, MatButtonToggleGroup } from '@angular/material/button-toggle';
import { MatError, MatFormField, MatLabel } from '@angular/material/form-field';
import { MatInput } from '@angular/material/input';
import { MatOption, MatSelect } from '@angular/material/select';
import { MatSnackBar } from '@angular/material/snack-bar';
import type { Frame, PixelRegion, Roll, RollBaseRequest } from '@clearbase/contracts';
import { applyFieldProblems } from '../forms/apply-field-problems';
import { readProblem } from '../problem/read-problem';
import { RollsApi } from './rolls-api';

/**
 * A roll's film base: the one measured, and how it is found — the median of the frames' own bases, or a rectangle
 * drawn on one frame (a leader or the rebate). The server's complaints land on the fields they name.
 */
@Component({
  selector: 'cb-roll-base-form',
  imports: [
    DecimalPipe,
    ReactiveFormsModule,
    MatButton,
    MatButtonToggleGroup,
    MatButtonToggle,
    MatFormField,
    MatLabel,
    MatError,
    MatInput,
    MatSelect,
    MatOption,
  ],
  templateUrl: './roll-base-form.html',
  styleUrls: ['./roll-base-form.scss', './roll-card.scss'],
  changeDetection: ChangeDetectionStrategy.OnPush,
  host: { class: 'card' },
})
export class RollBaseForm {
  private readonly api = inject(RollsApi);
  private readonly snackBar = inject(MatSnackBar);
  private readonly fb = inject(NonNullableFormBuilder);

  readonly roll = input.required<Roll>();
  /** The frames a rectangle may be drawn on. */
  readonly frames = input.required<readonly Frame[]>();
  /** The server kept the new base. */
  readonly saved = output<void>();

  protected readonly form = this.fb.group({
    mode: this.fb.control<RollBaseRequest['mode']>('auto'),
    frameId: this.fb.control<number | null>(null, Validators.required),
    x: this.fb.control<number | null>(0, [Validators.required, Validators.min(0)]),
    y: this.fb.control<number | null>(0, [Validators.required, Validators.min(0)]),
    width: this.fb.control<number | null>(null, [Validators.required, Validators.min(1)]),
    height: this.fb.control<number | null>(null, [Validators.required, Validators.min(1)]),
  });
  protected readonly mode = toSignal(this.form.controls.mode.valueChanges, {
    initialValue: 'auto' as const,
  });
  protected readonly rectangleFields = [
    { name: 'x', label: 'Left' },
    { name: 'y', label: 'Top' },
    { name: 'width', label: 'Width' },
    { name: 'height', label: 'Height' },
  ] as const;
  protected readonly problem = signal<string | null>(null);
  protected readonly saving = signal(false);

  constructor() {
    // the form starts from the roll's base as stored, once per roll
    let formFor: number | null = null;
    effect(() => {
      const roll = this.roll();
      if (formFor === roll.id) return;
      formFor = roll.id;
      const region = roll.base.region;
      this.form.reset({
        mode: roll.base.mode,
        frameId: roll.base.frameId,
        x: region?.x ?? 0,
        y: region?.y ?? 0,
        width: region?.width ?? null,
        height: region?.height ?? null,
      });
    });
  }

  /** Starts a roll base on a frame, from a rectangle of it when there is one. */
  startFrom(frameId: number, region: PixelRegion | null): void {
    this.form.patchValue({
      mode: 'region',
      frameId,
      ...(region ? { x: region.x, y: region.y, width: region.width, height: region.height } : {}),
    });
  }

  protected save(): void {
    if (this.saving()) return;
    const v = this.form.getRawValue();
    let request: RollBaseRequest;
    if (v.mode === 'auto') {
      request = { mode: 'auto' };
    } else {
      this.form.markAllAsTouched();
      if (this.form.invalid) return;
      request = {
        mode: 'region',
        frameId: Number(v.frameId),
        region: { x: Number(v.x), y: Number(v.y), width: Number(v.width), height: Number(v.height) },
      };
    }
    this.saving.set(true);
    this.problem.set(null);
    this.api.setBase(this.roll().id, request).subscribe({
      next: () => {
        this.saving.set(false);
        this.saved.emit();
        this.snackBar.open('Roll base saved.', undefined, { duration: 4000 });
      },
      error: (err: unknown) => {
        this.saving.set(false);
        const p = readProblem(err);
        const rest = applyFieldProblems(p.fieldErrors, (path) =>
          this.form.get(path.replace(/^body\.(region\.)?/, '')),
        );
        this.problem.set([p.message, ...rest].join(' '));
      },
    });
  }

  protected error(name: string): string {
    const e = this.form.get(name)?.errors;
    if (!e) return '';
    if (e['server']) return String(e['server']);
    if (e['required']) return 'Required';
    if (e['min']) return `At least ${(e['min'] as { min: number }).min}`;
    return 'Check this value';
  }
}
