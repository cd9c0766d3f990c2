import type { AbstractControl, ValidationErrors, ValidatorFn } from '@angular/forms';

/** A control point as the table holds it: a blank cell is null. */
export interface EditablePoint {
  logExposure: number | null;
  density: number | null;
}

/** One complaint about a curve's control points; `index` is the row, from 0. */
export interface CurvePointProblem {
  index: number;
  field: 'logExposure' | 'density' | 'points';
  message: string;
}

/**
 * What is wrong with a channel's control points: blanks, fewer than two points, and log H or D that does not
 * increase strictly from one row to the next (the curve must be monotone to be inverted).
 * @example curvePointProblems([{ logExposure: 0, density: 1 }, { logExposure: -1, density: 2 }]) // [{ index: 1, field: 'logExposure', … }]
 */
export function curvePointProblems(points: readonly EditablePoint[]): CurvePointProblem[] {
  const problems: CurvePointProblem[] = [];
  if (points.length < 2)
    problems.push({ index: 0, field: 'points', message: 'A curve needs at least two points.' });
  points.forEach((p, i) => {
    for (const field of ['logExposure', 'density'] as const) {
      const value = p[field];
      if (value === null || !Number.isFinite(value))
        problems.push({
          index: i,
          field,
          message: `Point ${i + 1}: enter ${field === 'logExposure' ? 'log H' : 'D'}.`,
        });
    }
    if (i === 0) return;
    const prev = points[i - 1]!;
    if (p.logExposure !== null && prev.logExposure !== null && !(p.logExposure > prev.logExposure))
      problems.push({
        index: i,
        field: 'logExposure',
        message: `Point ${i + 1}: log H must be above point ${i}’s (${prev.logExposure}).`,
      });
    if (p.density !== null && prev.density !== null && !(p.density > prev.density))
      problems.push({
        index: i,
        field: 'density',
        message: `Point ${i + 1}: D must be above point ${i}’s (${prev.density}).`,
      });
  });
  return problems;
}

/**
 * Validator of a points form array: `{ curvePoints: CurvePointProblem[] }` when `curvePointProblems` finds any.
 * @example new FormArray(rows, { validators: increasingPoints })
 */
export const increasingPoints: ValidatorFn = (control: AbstractControl): ValidationErrors | null => {
  const problems = curvePointProblems(control.value as EditablePoint[]);
  return problems.length ? { curvePoints: problems } : null;
};
