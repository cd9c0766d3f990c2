import {
  makeReferenceNegative,
  REFERENCE_SIZE,
  type ReferenceFilm,
  type ReferenceNegative,
} from './reference-negative';

/** Makes a reference negative somewhere other than the caller's thread (a worker pool in the server). */
export type ReferenceNegativeMaker = (
  film: ReferenceFilm,
  size: { width: number; height: number },
) => Promise<ReferenceNegative>;

// 8 negatives of 1.5 megapixels are 72 MB: room for a lab's stocks in use and the drafts being edited (our choice)
const keptNegatives = 8;

/**
 * A cache of reference negatives by film (the stock's fields and the version's crosstalk): each is made once (it
 * takes a second or two, on `make`'s thread) and kept, the least recently asked for leaving first beyond
 * `keep`; requests that arrive while it is being made wait for that one making. A making that fails is forgotten,
 * so the next request tries again.
 * @example const referenceFor = createReferenceNegativeCache(); (await referenceFor(film)) === (await referenceFor(film)) // true
 */
export function createReferenceNegativeCache(
  size: { width: number; height: number } = REFERENCE_SIZE,
  make: ReferenceNegativeMaker = async (film, at) => makeReferenceNegative(film, at),
  keep: number = keptNegatives,
): (film: ReferenceFilm) => Promise<ReferenceNegative> {
  const cache = new Map<string, Promise<ReferenceNegative>>();
  return (film) => {
    // the fields the negative depends on, so an edited stock or a changed crosstalk gets a fresh negative
    const { name, iso, masked, base_material } = film.stock;
    const key = JSON.stringify([name, iso, masked, base_material, film.crosstalk]);
    let negative = cache.get(key);
    if (negative) {
      cache.delete(key);
    } else {
      negative = make(film, size);
      negative.catch(() => {
        if (cache.get(key) === negative) cache.delete(key);
      });
    }
    cache.set(key, negative);
    while (cache.size > keep) cache.delete(cache.keys().next().value!);
    return negative;
  };
}
