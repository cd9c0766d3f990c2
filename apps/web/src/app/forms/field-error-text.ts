import type { ValidationErrors } from '@angular/forms';

/** Words for the validators whose failure says nothing by itself (a pattern means something else in each form). */
export interface FieldErrorWords {
  pattern?: string;
}

/**
 * The message a form field shows under it for its first failing check; the server's own words win.
 * `Validators.min(Number.MIN_VALUE)` reads as "Above 0" (strictly positive fields).
 *
 * @example
 * fieldErrorText({ max: { max: 6400, actual: 9000 } }); // 'At most 6400'
 * fieldErrorText({ pattern: {} }, { pattern: 'A whole number' }); // 'A whole number'
 */
export function fieldErrorText(
  errors: ValidationErrors | null | undefined,
  words: FieldErrorWords = {},
): string {
  const e = errors;
  if (!e) return '';
  if (e['server']) return String(e['server']);
  if (e['required']) return 'Required';
  if (e['min']) {
    const min = (e['min'] as { min: number }).min;
    return min === Number.MIN_VALUE ? 'Above 0' : `At least ${min}`;
  }
  if (e['max']) return `At most ${(e['max'] as { max: number }).max}`;
  if (e['wholeNumber']) return 'A whole number';
  if (e['maxlength'])
    return `At most ${(e['maxlength'] as { requiredLength: number }).requiredLength} characters`;
  if (e['pattern'] && words.pattern) return words.pattern;
  return 'Check this value';
}
