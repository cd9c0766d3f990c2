import type { MeasuredBase } from '@clearbase/contracts';

/** What is known of a frame's or a roll's base: set automatically or by a drawn rectangle, and what was measured. */
export interface FilmBaseFacts {
  mode: 'auto' | 'region';
  measured: MeasuredBase | null;
}
