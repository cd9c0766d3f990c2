import type { ValidationErrors, ValidatorFn } from '@angular/forms';
import { fieldErrorText } from '../forms/field-error-text';

// The server's limits (libs/contracts stocks/stock.ts), written out to keep zod out of the browser bundle:
// speeds 6 to 25600, latitude 0 to 10 stops, p from 1 to 2 (common practice of the trade, from memory).
export const speedRange = { min: 6, max: 25600 } as const;
export const latitudeRange = { min: 0, max: 10 } as const;
export const reciprocityExponentRange = { min: 1, max: 2 } as const;
// p = 1.3 suits many films: common practice of the trade, from memory (the server's default too)
export const defaultReciprocityExponent = 1.3;
// the server's longest note (libs/contracts stocks/stock.ts)
export const noteMaxLength = 4000;

/** A whole number, or nothing entered. */
export const wholeNumber: ValidatorFn = (c) =>
  c.value === null || c.value === '' || Number.isInteger(Number(c.value)) ? null : { wholeNumber: true };

/** The message a stock field shows under it, its first complaint first; the server's own words win. */
export function stockFieldError(errors: ValidationErrors | null | undefined): string {
  return fieldErrorText(errors, { pattern: 'List at least one format, separated by commas' });
}
