import {
  AMBERMASK_100,
  exposeNegative,
  greySteps,
  LINEAR_SCANNER,
  outdoorScene,
  POLYCLEAR_200,
  TINTLINE_400,
  type FilmStock,
  type Rgb,
  type Scene,
} from '@clearbase/inversion';
import type { ScannerProfile } from '@clearbase/contracts';
import type { StockRow } from '../db/database';
import { baseOf } from './default-profile-document';
import { demoStocks } from './demo-catalogue-seed';

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

/** Size of a reference negative: 1500 × 1000 is 1.5 megapixels, the size the live preview is meant for. */
export const REFERENCE_SIZE = { width: 1500, height: 1000 } as const;
// Density noise of fine-grained colour negative film at preview scale: invented demo value, from memory
const referenceGrain = 0.004;
// A fixed seed, so a stock's reference negative is the same bytes on every start.
const referenceSeed = 7;
// Eleven neutral steps from 3 % to 90 % reflectance: the range of a printed grey scale, from memory
const wedge = { steps: 11, darkest: 0.03, lightest: 0.9 } as const;

/** The forward-model film of each base kind when a stock is not one of the demo lab's. */
const filmByBase: Record<'clear' | 'tinted' | 'masked', FilmStock> = {
  clear: POLYCLEAR_200,
  tinted: TINTLINE_400,
  masked: AMBERMASK_100,
};

/**
 * The forward-model film for a catalogue stock: the invented film of its base kind, with the demo lab's gammas and
 * crosstalk when the stock is one of the demo stocks, so the demo profiles render their own reference frames well.
 * @example filmStockFor(stockRow).base // 'tinted' for a tinted polyester stock
 */
export function filmStockFor(stock: Pick<StockRow, 'name' | 'iso' | 'masked' | 'base_material'>): FilmStock {
  const kind = baseOf(stock);
  const film = filmByBase[kind];
  const demo = demoStocks.find((d) => d.stock.name === stock.name);
  if (!demo) return { ...film, name: stock.name, iso: stock.iso };
  const c = demo.crosstalk;
  return {
    ...film,
    name: stock.name,
    iso: stock.iso,
    gamma: [...demo.gammas],
    crosstalk: [
      [1 - 2 * c, c, c],
      [c, 1 - 2 * c, c],
      [c, c, 1 - 2 * c],
    ],
  };
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
 * Exposes the reference scene (outdoor scene and neutral wedge, normally exposed) on the stock's film and scans it
 * through a linear scanner. Deterministic: the same stock gives the same counts.
 * @example makeReferenceNegative(stockRow, { width: 150, height: 100 }).data.length // 150 * 100 * 3
 */
export function makeReferenceNegative(
  stock: Pick<StockRow, 'name' | 'iso' | 'masked' | 'base_material'>,
  size: { width: number; height: number } = REFERENCE_SIZE,
): ReferenceNegative {
  const negative = exposeNegative(referenceScene(size.width, size.height), {
    stock: filmStockFor(stock),
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

/** Makes a reference negative somewhere other than the caller's thread (a worker pool in the server). */
export type ReferenceNegativeMaker = (
  stock: Pick<StockRow, 'name' | 'iso' | 'masked' | 'base_material'>,
  size: { width: number; height: number },
) => Promise<ReferenceNegative>;

/**
 * A per-stock cache of reference negatives: each is made once (it takes a second or two, on `make`'s thread) and
 * kept; requests that arrive while it is being made wait for that one making. A making that fails is forgotten, so
 * the next request tries again.
 * @example const referenceFor = createReferenceNegativeCache(); (await referenceFor(stockRow)) === (await referenceFor(stockRow)) // true
 */
export function createReferenceNegativeCache(
  size: { width: number; height: number } = REFERENCE_SIZE,
  make: ReferenceNegativeMaker = async (stock, at) => makeReferenceNegative(stock, at),
): (stock: StockRow) => Promise<ReferenceNegative> {
  const cache = new Map<string, Promise<ReferenceNegative>>();
  return (stock) => {
    // the stock's fields the negative depends on, so an edited stock gets a fresh negative
    const key = JSON.stringify([stock.id, stock.name, stock.iso, stock.masked, stock.base_material]);
    let negative = cache.get(key);
    if (!negative) {
      negative = make(stock, size);
      cache.set(key, negative);
      negative.catch(() => cache.delete(key));
    }
    return negative;
  };
}
