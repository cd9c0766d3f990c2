import type { OutputFormat, ReviewDecision } from '@clearbase/contracts';
import { outputFormats } from '@clearbase/contracts';
import type { Kysely } from 'kysely';
import type { Database } from '../db/database';

/** A finished frame of an order and the stored files of its full-size outputs. */
export interface FinishedFrame {
  id: number;
  rollId: number;
  /** Position of the roll in the order, from 1. */
  rollNumber: number;
  index: number;
  fileName: string;
  width: number;
  height: number;
  /** The operator's decision; null while not reviewed. */
  decision: ReviewDecision | null;
  outputs: { format: OutputFormat; sha256: string; mediaType: string }[];
}

/**
 * The finished frames of an order: rendered (`done`), not excluded by the operator's review, with at least one
 * full-size output; in roll order, then frame order. Staff get them all; a customer only those customerFileAccess
 * lets through (approved, once the order is released).
 *
 * @example
 * const frames = await finishedFramesOfOrder(db, order.id);
 */
export async function finishedFramesOfOrder(db: Kysely<Database>, orderId: number): Promise<FinishedFrame[]> {
  const rolls = await db
    .selectFrom('rolls')
    .select('id')
    .where('order_id', '=', orderId)
    .orderBy('id')
    .execute();
  const rollNumber = new Map(rolls.map((r, i) => [r.id, i + 1]));
  if (rolls.length === 0) return [];
  const rows = await db
    .selectFrom('frames')
    .innerJoin('frame_outputs', 'frame_outputs.frame_id', 'frames.id')
    .innerJoin('files', 'files.id', 'frame_outputs.file_id')
    .leftJoin('frame_reviews', 'frame_reviews.frame_id', 'frames.id')
    .select([
      'frames.id',
      'frames.roll_id',
      'frames.frame_index',
      'frames.file_name',
      'frames.width',
      'frames.height',
      'frame_outputs.kind',
      'files.sha256',
      'files.media_type',
      'frame_reviews.decision',
    ])
    .where(
      'frames.roll_id',
      'in',
      rolls.map((r) => r.id),
    )
    .where('frames.status', '=', 'done')
    .where('frame_outputs.kind', 'in', [...outputFormats])
    .where((eb) =>
      eb.or([eb('frame_reviews.decision', 'is', null), eb('frame_reviews.decision', '!=', 'excluded')]),
    )
    .orderBy('frames.roll_id')
    .orderBy('frames.frame_index')
    .execute();
  const frames = new Map<number, FinishedFrame>();
  for (const r of rows) {
    let frame = frames.get(r.id);
    if (!frame) {
      frame = {
        id: r.id,
        rollId: r.roll_id,
        rollNumber: rollNumber.get(r.roll_id)!,
        index: r.frame_index,
        fileName: r.file_name,
        width: r.width,
        height: r.height,
        decision: r.decision,
        outputs: [],
      };
      frames.set(r.id, frame);
    }
    frame.outputs.push({ format: r.kind as OutputFormat, sha256: r.sha256, mediaType: r.media_type });
  }
  for (const f of frames.values()) {
    f.outputs.sort((a, b) => outputFormats.indexOf(a.format) - outputFormats.indexOf(b.format));
  }
  return [...frames.values()];
}
