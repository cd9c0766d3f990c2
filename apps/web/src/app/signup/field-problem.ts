/** A server field error for a form control, whether the problem names it `body.email` or `email`. */
export function fieldProblem(errors: Readonly<Record<string, string>>, field: string): string | undefined {
  return errors[`body.${field}`] ?? errors[field];
}
