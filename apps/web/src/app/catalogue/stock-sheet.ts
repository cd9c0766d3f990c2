import { ChangeDetectionStrategy, Component, computed, input } from '@angular/core';
import type { Stock } from '@clearbase/contracts';
import { reciprocityThresholdSeconds } from './corrected-exposure-seconds';
import { ReciprocityCalculator } from './reciprocity-calculator';
import { maskingLabel, processLabel } from './stock-labels';

/** A latitude as a person reads it: "2 stops under, 3 stops over". */
export function latitudeText(stock: Pick<Stock, 'latitudeUnderStops' | 'latitudeOverStops'>): string | null {
  const stops = (n: number) => `${n} ${n === 1 ? 'stop' : 'stops'}`;
  const parts: string[] = [];
  if (stock.latitudeUnderStops !== null) parts.push(`${stops(stock.latitudeUnderStops)} under`);
  if (stock.latitudeOverStops !== null) parts.push(`${stops(stock.latitudeOverStops)} over`);
  return parts.length ? parts.join(', ') : null;
}

/** What a customer reads about a stock: its facts, how to rate and expose it, and how to handle it. */
@Component({
  selector: 'cb-stock-sheet',
  imports: [ReciprocityCalculator],
  templateUrl: './stock-sheet.html',
  styleUrl: './stock-sheet.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class StockSheet {
  readonly stock = input.required<Stock>();

  protected readonly processLabel = processLabel;
  protected readonly maskingLabel = maskingLabel;
  protected readonly threshold = reciprocityThresholdSeconds;
  protected readonly latitude = computed(() => latitudeText(this.stock()));
  protected readonly ratedAtBoxSpeed = computed(() => {
    const s = this.stock();
    return s.recommendedEi === null || s.recommendedEi === s.iso;
  });
  /** Thin polyester bases are stiff and slippery; some cameras that load film themselves misfeed them. */
  protected readonly polyester = computed(() => /polyester/i.test(this.stock().baseMaterial));
}
