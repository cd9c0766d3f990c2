import type { AbstractControl } from '@angular/forms';

/**
 * Puts the server's per-field complaints (problem document `errors`, paths like `body.iso` or
 * `body.inputProfile.gains.1`) on the form controls they concern, as a `server` error the field shows like any
 * other. `controlFor` maps a path to its control; complaints no control claims come back, for a banner.
 *
 * @example
 * const rest = applyFieldProblems(problem.fieldErrors, (path) => form.get(path.replace(/^body\./, '')));
 */
export function applyFieldProblems(
  fieldErrors: Readonly<Record<string, string>>,
  controlFor: (path: string) => AbstractControl | null | undefined,
): string[] {
  const unclaimed: string[] = [];
  for (const [path, message] of Object.entries(fieldErrors)) {
    const control = controlFor(path);
    if (control) {
      control.setErrors({ ...control.errors, server: message });
      control.markAsTouched();
    } else {
      unclaimed.push(`${path}: ${message}`);
    }
  }
  return unclaimed;
}

/** The first segment after `body.`: the top-level field of a request body a complaint is about. */
export function bodyField(path: string): string {
  return path.replace(/^body\./, '').split('.')[0] ?? path;
}

/** The path after `body.`, whole: the control a complaint is about in a form shaped like the request body. */
export function bodyPath(path: string): string {
  return path.replace(/^body\./, '');
}
