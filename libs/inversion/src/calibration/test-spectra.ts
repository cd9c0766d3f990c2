// Spectral scenes for the independent film models of the calibration tests (test-film-models.ts). For tests only:
// index.ts does not export it. Built apart from forward-model.ts: the models expose film through spectra, not
// through a matrix of linear sRGB.
import { D50_WHITE, labToXyz } from '../lab';
import type { Rgb } from '../srgb';

/** Wavelengths sampled, nm: 400 … 700 every 10 nm (the visible range a film layer and a scanner band use). */
export const WAVELENGTHS: readonly number[] = Array.from({ length: 31 }, (_, i) => 400 + 10 * i);

/** A spectrum sampled at `WAVELENGTHS`. */
export type Spectrum = Float64Array;

/** A spectrum from a function of wavelength (nm). */
export function spectrum(f: (nm: number) => number): Spectrum {
  return Float64Array.from(WAVELENGTHS, f);
}

/** A Gaussian lobe of peak 1 at `peak` nm, with widths (standard deviations, nm) below and above the peak. */
export function lobe(nm: number, peak: number, below: number, above = below): number {
  const t = (nm - peak) / (nm < peak ? below : above);
  return Math.exp(-0.5 * t * t);
}

/**
 * CIE 1931 2° colour matching functions, the multi-lobe fit of C. Wyman, P.-P. Sloan, P. Shirley, "Simple analytic
 * approximations to the CIE XYZ color matching functions", JCGT 2(2):1-11, 2013 (coefficients from memory).
 */
export function cieObserver(nm: number): Rgb {
  return [
    1.056 * lobe(nm, 599.8, 37.9, 31.0) +
      0.362 * lobe(nm, 442.0, 16.0, 26.7) -
      0.065 * lobe(nm, 501.1, 20.4, 26.2),
    0.821 * lobe(nm, 568.8, 46.9, 40.5) + 0.286 * lobe(nm, 530.9, 16.3, 31.1),
    1.217 * lobe(nm, 437.0, 11.8, 36.0) + 0.681 * lobe(nm, 459.0, 26.0, 13.8),
  ];
}

/**
 * Relative spectral power of a black body at `kelvin` (Planck's law, c2 = 1.4388e-2 m·K, CODATA), peak-free scale.
 * The taking light of the test scenes: 5003 K, the correlated colour temperature of D50 (CIE 015:2018).
 */
export function blackBody(nm: number, kelvin: number): number {
  const m = nm * 1e-9;
  return 1 / (m ** 5 * (Math.exp(1.4388e-2 / (m * kelvin)) - 1)) / 1e30;
}

/** The taking light of the test scenes: a 5003 K black body. */
export const TAKING_LIGHT: Spectrum = spectrum((nm) => blackBody(nm, 5003));

/**
 * The observer under the taking light, each function scaled so a perfect white (reflectance 1) gives the D50 white
 * exactly (a von Kries scaling in XYZ: the scenes' colorimetry is relative to the white, as the chart's values are).
 */
const OBSERVER: [Spectrum, Spectrum, Spectrum] = (() => {
  const raw = [0, 1, 2].map((i) => spectrum((nm) => cieObserver(nm)[i]! * blackBody(nm, 5003)));
  return raw.map((s, i) => {
    const k = D50_WHITE[i]! / s.reduce((a, b) => a + b, 0);
    return s.map((v) => v * k);
  }) as [Spectrum, Spectrum, Spectrum];
})();

/** XYZ (D50 white at reflectance 1) of a reflectance spectrum under the taking light. */
export function reflectanceToXyz(reflectance: Spectrum): Rgb {
  return OBSERVER.map((w) => w.reduce((s, v, i) => s + v * reflectance[i]!, 0)) as Rgb;
}

const basis = (nm: number): Rgb => {
  const t = (nm - 550) / 150;
  return [1, t, t * t];
};
const logistic = (z: number) => 1 / (1 + Math.exp(-z));

/**
 * A smooth reflectance spectrum whose XYZ under the taking light is `xyz`: the logistic of a quadratic in wavelength
 * (W. Jakob, J. Hanika, "A low-dimensional function space for efficient spectral upsampling", Computer Graphics
 * Forum 38(2), 2019), its three coefficients by damped Newton's method. Always between 0 and 1, as a print's is.
 * Throws a RangeError when no such spectrum is found (a colour no reflecting surface shows).
 * @example reflectanceFromXyz(labToXyz([50, 0, 0], D50_WHITE)) // ≈ 0.184 at every wavelength
 */
export function reflectanceFromXyz(xyz: Rgb): Spectrum {
  const make = (c: Rgb) => spectrum((nm) => logistic(basis(nm).reduce((s, b, j) => s + b * c[j]!, 0)));
  const y = Math.min(Math.max(xyz[1], 1e-4), 1 - 1e-4);
  let c: Rgb = [Math.log(y / (1 - y)), 0, 0];
  let r = make(c);
  let err = residual(r, xyz);
  for (let it = 0; it < 200 && norm(err) > 1e-10; it++) {
    const jac = OBSERVER.map((w) =>
      [0, 1, 2].map((j) =>
        w.reduce((s, v, i) => s + v * r[i]! * (1 - r[i]!) * basis(WAVELENGTHS[i]!)[j]!, 0),
      ),
    );
    const step = solve3(jac as [number[], number[], number[]], err);
    let scale = 1;
    for (;;) {
      const next = c.map((v, j) => v - scale * step[j]!) as Rgb;
      const rn = make(next);
      const en = residual(rn, xyz);
      if (norm(en) < norm(err) || scale < 1e-6) {
        c = next;
        r = rn;
        err = en;
        break;
      }
      scale /= 2;
    }
  }
  if (!(norm(err) < 1e-6))
    throw new RangeError(
      `Expected a colour a reflecting surface can show but received XYZ ${xyz.join(', ')}`,
    );
  return r;
}

/** The reflectance spectrum of a colour given as CIE L*a*b* under D50. */
export function reflectanceFromLabD50(lab: Rgb): Spectrum {
  return reflectanceFromXyz(labToXyz(lab, D50_WHITE));
}

function residual(r: Spectrum, xyz: Rgb): Rgb {
  const got = reflectanceToXyz(r);
  return [got[0] - xyz[0], got[1] - xyz[1], got[2] - xyz[2]];
}

function norm(v: Rgb): number {
  return Math.hypot(v[0], v[1], v[2]);
}

/** Solves a 3 × 3 system by Cramer's rule. */
function solve3(a: [number[], number[], number[]], b: Rgb): Rgb {
  const det = (m: number[][]) =>
    m[0]![0]! * (m[1]![1]! * m[2]![2]! - m[1]![2]! * m[2]![1]!) -
    m[0]![1]! * (m[1]![0]! * m[2]![2]! - m[1]![2]! * m[2]![0]!) +
    m[0]![2]! * (m[1]![0]! * m[2]![1]! - m[1]![1]! * m[2]![0]!);
  const d = det(a);
  return [0, 1, 2].map((j) => det(a.map((row, i) => row.map((v, k) => (k === j ? b[i]! : v)))) / d) as Rgb;
}
