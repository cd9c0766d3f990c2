import type { TuningFrame } from '@clearbase/contracts';
import type { Kysely } from 'kysely';
import type { Database } from '../db/database';
import { outputFormatsOfFrames, toFrame } from '../frames/frame-repository';
import type { FrameRow } from '../frames/frame-tables';
import { reviewsOfFrames } from './review-repository';

/** Frames as the tuning screen sees them: each with its outputs and its latest review (null before any). */
export async function framesWithReviews(
  db: Kysely<Database>,
  rows: readonly FrameRow[],
): Promise<TuningFrame[]> {
  const ids = rows.map((f) => f.id);
  const [outputs, reviews] = await Promise.all([outputFormatsOfFrames(db, ids), reviewsOfFrames(db, ids)]);
  return rows.map((f) => ({ ...toFrame(f, outputs.get(f.id)), review: reviews.get(f.id) ?? null }));
}
