import { makeReferenceNegative, type ReferenceFilm, type ReferenceNegative } from './reference-negative';

/** What a worker thread is asked to make: a film's reference negative at a size. */
export interface ReferenceNegativeTask {
  film: ReferenceFilm;
  size: { width: number; height: number };
}

/**
 * Worker-thread entry: makes a reference negative off the server's event loop (the forward model takes seconds on
 * 1.5 megapixels). Run through `generateReferenceNegative`, not directly.
 * @example await piscina.run({ film, size: { width: 150, height: 100 } }) // a ReferenceNegative
 */
export default function referenceNegativeTask(task: ReferenceNegativeTask): ReferenceNegative {
  return makeReferenceNegative(task.film, task.size);
}
