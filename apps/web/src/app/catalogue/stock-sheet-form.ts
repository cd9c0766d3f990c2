import { Validators, type NonNullableFormBuilder } from '@angular/forms';
import type { Stock, UpdateStockSheetRequest } from '@clearbase/contracts';
import {
  latitudeRange,
  noteMaxLength,
  reciprocityExponentRange,
  speedRange,
  wholeNumber,
} from './stock-limits';

/** What a stock's sheet form starts from: a saved stock's sheet, or a new stock's defaults. */
export type StockSheetStart = Pick<
  Stock,
  | 'notes'
  | 'recommendedEi'
  | 'latitudeUnderStops'
  | 'latitudeOverStops'
  | 'pushPullNotes'
  | 'reciprocityExponent'
  | 'handlingNotes'
>;

/**
 * The controls of a stock's sheet — notes, recommended EI, latitude, push and pull, reciprocity exponent and
 * handling — with the server's limits, to spread into a dialog's form group beside its own fields.
 *
 * @example
 * form = inject(NonNullableFormBuilder).group({ name: [''], ...stockSheetControls(fb, stock) });
 */
export function stockSheetControls(fb: NonNullableFormBuilder, start: StockSheetStart) {
  return {
    notes: fb.control(start.notes, [Validators.maxLength(noteMaxLength)]),
    recommendedEi: fb.control<number | null>(start.recommendedEi, [
      Validators.min(speedRange.min),
      Validators.max(speedRange.max),
      wholeNumber,
    ]),
    latitudeUnderStops: fb.control<number | null>(start.latitudeUnderStops, [
      Validators.min(latitudeRange.min),
      Validators.max(latitudeRange.max),
    ]),
    latitudeOverStops: fb.control<number | null>(start.latitudeOverStops, [
      Validators.min(latitudeRange.min),
      Validators.max(latitudeRange.max),
    ]),
    pushPullNotes: fb.control(start.pushPullNotes, [Validators.maxLength(noteMaxLength)]),
    reciprocityExponent: fb.control<number | null>(start.reciprocityExponent, [
      Validators.required,
      Validators.min(reciprocityExponentRange.min),
      Validators.max(reciprocityExponentRange.max),
    ]),
    handlingNotes: fb.control(start.handlingNotes, [Validators.maxLength(noteMaxLength)]),
  };
}

/** The sheet part of a request from the form's raw value: notes trimmed, empty numbers as `null`. */
export function stockSheetRequest(v: {
  notes: string;
  recommendedEi: number | null;
  latitudeUnderStops: number | null;
  latitudeOverStops: number | null;
  pushPullNotes: string;
  reciprocityExponent: number | null;
  handlingNotes: string;
}): Required<UpdateStockSheetRequest> {
  return {
    notes: v.notes.trim(),
    recommendedEi: v.recommendedEi ?? null,
    latitudeUnderStops: v.latitudeUnderStops ?? null,
    latitudeOverStops: v.latitudeOverStops ?? null,
    pushPullNotes: v.pushPullNotes.trim(),
    reciprocityExponent: Number(v.reciprocityExponent),
    handlingNotes: v.handlingNotes.trim(),
  };
}
