/** A frame whose film base cannot be used (none found, or a drawn rectangle holding no film). */
export class FilmBaseError extends Error {
  readonly code = 'no-base';
}
