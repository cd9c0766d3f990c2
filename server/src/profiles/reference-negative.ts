import {
  AMBERMASK_100,
  exposeNegative,
  greySteps,
  LINEAR_SCANNER,
  outdoorScene,
  POLYCLEAR_200,
  TINTLINE_400,
  type FilmStock,
  type Matrix3,
  type Rgb,
  type Scene,
} from '@clearbase/inversion';
import type { ScannerProfile } from '@clearbase/contracts';
import type { StockRow } from '../db/database';
import { baseOf } from './default-profile-document';

/** A negative made by the forward model for previews: interleaved 16-bit RGB counts and its film base. */
export interface ReferenceNegative {
  width: number;
  height: number;
  /** Interleaved RGB scanner counts, 0..65535. */
  data: Uint16Array;
  /** Linear light of base + fog, 0..1 of full scale, per channel. */
  base: Rgb;
  /** How the counts encode light (the negative is made through a linear scanner). */
  scanner: ScannerProfile;
}

/**
 * What a reference negative is made from: the stock's base and speed, and the dye crosstalk of the profile version
 * it previews, so the version renders its own reference frame clean and an edit shows as a change from it.
 */
export interface ReferenceFilm {
  stock: Pick<StockRow, 'name' | 'iso' | 'masked' | 'base_material'>;
  /** The profile version's crosstalk correction M, row-major. */
  crosstalk: Matrix3;
}

/** Size of a reference negative: 1500 × 1000 is 1.5 megapixels, the size the live preview is meant for. */
export const REFERENCE_SIZE = { width: 1500, height: 1000 } as const;
// Density noise of fine-grained colour negative film at preview scale: an invented value, from memory
const referenceGrain = 0.004;
// A fixed seed, so a film's reference negative is the same bytes on every start.
const referenceSeed = 7;
// Eleven neutral steps from 3 % to 90 % reflectance: the range of a printed grey scale, from memory
const wedge = { steps: 11, darkest: 0.03, lightest: 0.9 } as const;

/** The forward-model film of each base kind. */
const filmByBase: Record<'clear' | 'tinted' | 'masked', FilmStock> = {
  clear: POLYCLEAR_200,
  tinted: TINTLINE_400,
  masked: AMBERMASK_100,
};

/**
 * The forward-model film for a reference negative: the invented film of the stock's base kind, named and rated as
 * the stock, with the crosstalk of the profile version previewed.
 * @example filmStockFor({ stock: stockRow, crosstalk: version.parameters.crosstalk }).base // 'tinted' for a tinted polyester stock
 */
export function filmStockFor({ stock, crosstalk }: ReferenceFilm): FilmStock {
  const film = filmByBase[baseOf(stock)];
  return { ...film, name: stock.name, iso: stock.iso, crosstalk: structuredClone(crosstalk) };
}

/** The outdoor scene with a neutral wedge across its bottom tenth, so balance changes show on greys too. */
function referenceScene(width: number, height: number): Scene {
  const scene = outdoorScene(width, height);
  const stepWidth = Math.ceil(width / wedge.steps);
  const wedgeHeight = Math.max(1, Math.round(height / 10));
  const steps = greySteps(wedge.steps, wedge.darkest, wedge.lightest, stepWidth, wedgeHeight);
  for (let y = 0; y < wedgeHeight; y++) {
    const row = steps.rgb.subarray(y * steps.width * 3, (y * steps.width + width) * 3);
    scene.rgb.set(row, (height - wedgeHeight + y) * width * 3);
  }
  return scene;
}

/**
 * Exposes the reference scene (outdoor scene and neutral wedge, normally exposed) on the film and scans it through
 * a linear scanner. Deterministic: the same film gives the same counts.
 * @example makeReferenceNegative({ stock: stockRow, crosstalk }, { width: 150, height: 100 }).data.length // 150 * 100 * 3
 */
export function makeReferenceNegative(
  film: ReferenceFilm,
  size: { width: number; height: number } = REFERENCE_SIZE,
): ReferenceNegative {
  const negative = exposeNegative(referenceScene(size.width, size.height), {
    stock: filmStockFor(film),
    scanner: LINEAR_SCANNER,
    grain: referenceGrain,
    seed: referenceSeed,
  });
  return {
    width: negative.width,
    height: negative.height,
    data: negative.data,
    base: negative.truth.base,
    scanner: LINEAR_SCANNER,
  };
}
