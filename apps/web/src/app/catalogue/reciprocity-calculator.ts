import { ChangeDetectionStrategy, Component, computed, input } from '@angular/core';
import { toSignal } from '@angular/core/rxjs-interop';
import { FormControl, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatError, MatFormField, MatHint, MatLabel, MatSuffix } from '@angular/material/form-field';
import { MatInput } from '@angular/material/input';
import { correctedExposureSeconds, reciprocityThresholdSeconds } from './corrected-exposure-seconds';

// A day is longer than any exposure worth correcting by a power law; the bound only keeps the field sane (our choice).
const longestMeteredSeconds = 86_400;

/** Seconds as a person reads them: two decimals, and minutes too from one minute up. */
export function formatSeconds(seconds: number): string {
  const text = `${seconds.toFixed(2)} s`;
  if (seconds < 60) return text;
  const minutes = Math.floor(seconds / 60);
  const rest = Math.round(seconds - minutes * 60);
  return `${text} (${minutes} min ${rest} s)`;
}

/** Metered seconds in, corrected seconds out, by the stock's reciprocity exponent. */
@Component({
  selector: 'cb-reciprocity-calculator',
  imports: [ReactiveFormsModule, MatFormField, MatLabel, MatInput, MatSuffix, MatHint, MatError],
  template: `
    <div class="calculator">
      <mat-form-field appearance="outline" class="metered">
        <mat-label>Metered time</mat-label>
        <input
          matInput
          type="number"
          min="0"
          step="any"
          [formControl]="metered"
          data-testid="reciprocity-metered"
        />
        <span matTextSuffix>s</span>
        @if (metered.hasError('required')) {
          <mat-error>Enter the metered time in seconds</mat-error>
        } @else if (metered.hasError('min')) {
          <mat-error>Enter a time above 0 s</mat-error>
        } @else if (metered.hasError('max')) {
          <mat-error>Enter at most {{ longest }} s</mat-error>
        }
        <mat-hint>p = {{ exponent() }}</mat-hint>
      </mat-form-field>
      <div class="result" aria-live="polite">
        @if (result(); as r) {
          <span class="label">Corrected time</span>
          <span class="value" data-testid="reciprocity-corrected">{{ r.text }}</span>
          @if (r.corrected) {
            <span class="muted" data-testid="reciprocity-extra">{{ r.extraStops }} stops more light</span>
          } @else {
            <span class="muted" data-testid="reciprocity-none"
              >No correction at {{ threshold }} s or less</span
            >
          }
        } @else {
          <span class="muted">Enter a metered time to see the corrected one.</span>
        }
      </div>
    </div>
  `,
  styles: `
    .calculator {
      display: flex;
      flex-wrap: wrap;
      align-items: flex-start;
      gap: 16px 24px;
    }
    .metered {
      width: 200px;
    }
    .result {
      display: flex;
      flex-direction: column;
      gap: 2px;
      padding-top: 6px;
    }
    .label {
      font: var(--mat-sys-label-medium);
      color: var(--mat-sys-on-surface-variant);
    }
    .value {
      font: var(--mat-sys-title-large);
    }
    .muted {
      color: var(--mat-sys-on-surface-variant);
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ReciprocityCalculator {
  /** The stock's p in t_corrected = t_metered^p. */
  readonly exponent = input.required<number>();

  protected readonly threshold = reciprocityThresholdSeconds;
  protected readonly longest = longestMeteredSeconds;
  protected readonly metered = new FormControl<number | null>(null, [
    Validators.required,
    Validators.min(Number.MIN_VALUE),
    Validators.max(longestMeteredSeconds),
  ]);
  private readonly meteredValue = toSignal(this.metered.valueChanges, { initialValue: this.metered.value });

  protected readonly result = computed(() => {
    const metered = this.meteredValue();
    if (metered === null || !this.metered.valid) return null;
    const corrected = correctedExposureSeconds(metered, this.exponent());
    return {
      text: formatSeconds(corrected),
      corrected: corrected !== metered,
      extraStops: Math.log2(corrected / metered).toFixed(1),
    };
  });
}
