import {
  FormArray,
  FormControl,
  FormGroup,
  Validators,
  type AbstractControl,
  type ValidationErrors,
  type ValidatorFn,
} from '@angular/forms';
import type { CurvePoint, ProfileDocument } from '@clearbase/contracts';
import { increasingPoints } from './curve-point-problems';

/** The three channels, in the order the document and the chart use. */
export const channels = ['red', 'green', 'blue'] as const;
export type Channel = (typeof channels)[number];

export type NumberControl = FormControl<number | null>;
export type PointGroup = FormGroup<{ logExposure: NumberControl; density: NumberControl }>;
export type PointsArray = FormArray<PointGroup>;

/** The editor's typed form; its shape follows the profile document so a server error's path finds its field. */
export type ProfileForm = FormGroup<{
  curves: FormGroup<Record<Channel, FormGroup<{ points: PointsArray }>>>;
  crosstalk: FormArray<FormArray<NumberControl>>;
  balance: FormGroup<{ cyanRed: NumberControl; magentaGreen: NumberControl; yellowBlue: NumberControl }>;
  tone: FormGroup<{ contrast: NumberControl; blackPoint: NumberControl; whitePoint: NumberControl }>;
  saturation: NumberControl;
}>;

// Bounds below are the profile document schema's (libs/contracts profile-document.ts), checked here before sending.
const finite: ValidatorFn = (c) =>
  c.value === null || Number.isFinite(c.value) ? null : { finite: 'Enter a number.' };
const number = (value: number, ...validators: ValidatorFn[]): NumberControl =>
  new FormControl<number | null>(value, { validators: [Validators.required, finite, ...validators] });
const above =
  (min: number): ValidatorFn =>
  (c) =>
    c.value === null || c.value > min ? null : { above: `Must be above ${min}.` };

const whiteAboveBlack: ValidatorFn = (group: AbstractControl): ValidationErrors | null => {
  const { blackPoint, whitePoint } = group.value as { blackPoint: number | null; whitePoint: number | null };
  return blackPoint !== null && whitePoint !== null && !(whitePoint > blackPoint)
    ? { whiteAboveBlack: 'The white point must be above the black point.' }
    : null;
};

/** One row of a curve table. */
export function createPointGroup(point: CurvePoint): PointGroup {
  return new FormGroup({ logExposure: number(point.logExposure), density: number(point.density) });
}

/**
 * The form holding every editable parameter of a profile document, filled from it.
 * @example const form = createProfileForm(version.parameters); form.controls.balance.controls.magentaGreen.setValue(-2);
 */
export function createProfileForm(document: ProfileDocument): ProfileForm {
  const curve = (c: Channel) =>
    new FormGroup({
      points: new FormArray(document.curves[c].points.map(createPointGroup), {
        validators: increasingPoints,
      }),
    });
  return new FormGroup({
    curves: new FormGroup({ red: curve('red'), green: curve('green'), blue: curve('blue') }),
    crosstalk: new FormArray(document.crosstalk.map((row) => new FormArray(row.map((x) => number(x))))),
    balance: new FormGroup({
      cyanRed: number(document.balance.cyanRed),
      magentaGreen: number(document.balance.magentaGreen),
      yellowBlue: number(document.balance.yellowBlue),
    }),
    tone: new FormGroup(
      {
        contrast: number(document.tone.contrast, above(0), Validators.max(4)),
        blackPoint: number(document.tone.blackPoint, Validators.min(0), Validators.max(0.5)),
        whitePoint: number(document.tone.whitePoint, above(0), Validators.max(16)),
      },
      { validators: whiteAboveBlack },
    ),
    saturation: number(document.saturation, Validators.min(0), Validators.max(3)),
  });
}

const num = (v: number | null | undefined): number => (typeof v === 'number' ? v : Number.NaN);

/**
 * The profile document a form's value describes: the form's parameters over `base`, whose other fields (schema
 * version, id, version, stock, capture primaries, exposure matrix) the editor does not change. Blank cells become
 * NaN, which the schema refuses.
 * @example readProfileForm(form.getRawValue(), version.parameters).balance.magentaGreen
 */
export function readProfileForm(
  value: ReturnType<ProfileForm['getRawValue']>,
  base: ProfileDocument,
): ProfileDocument {
  const points = (c: Channel) =>
    value.curves[c].points.map((p) => ({ logExposure: num(p.logExposure), density: num(p.density) }));
  const row = (r: (number | null)[]) => [num(r[0]), num(r[1]), num(r[2])] as [number, number, number];
  return {
    // everything the editor does not change (labels, capture primaries, a calibration's exposure matrix, and any
    // field a later schema adds) is kept as it was
    ...base,
    curves: {
      red: { points: points('red') },
      green: { points: points('green') },
      blue: { points: points('blue') },
    },
    crosstalk: [row(value.crosstalk[0]!), row(value.crosstalk[1]!), row(value.crosstalk[2]!)],
    balance: {
      cyanRed: num(value.balance.cyanRed),
      magentaGreen: num(value.balance.magentaGreen),
      yellowBlue: num(value.balance.yellowBlue),
    },
    tone: {
      contrast: num(value.tone.contrast),
      blackPoint: num(value.tone.blackPoint),
      whitePoint: num(value.tone.whitePoint),
    },
    saturation: num(value.saturation),
  };
}

/**
 * The form control a server field error's path names, if any: `body.parameters.curves.red.points.2.density` or
 * `curves.red.points[2].density` → that cell.
 * @example controlAtPath(form, 'body.parameters.balance.magentaGreen') === form.controls.balance.controls.magentaGreen
 */
export function controlAtPath(form: ProfileForm, path: string): AbstractControl | null {
  const clean = path
    .replace(/^body\./, '')
    .replace(/^parameters\./, '')
    .replace(/\[(\d+)\]/g, '.$1');
  return clean ? form.get(clean) : null;
}
