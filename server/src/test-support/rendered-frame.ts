import type { ReviewDecision } from '@clearbase/contracts';
import sharp from 'sharp';
import { recordFile } from '../files/file-repository';
import { createFileStore } from '../files/file-store';
import type { FrameOutputKind } from '../frames/frame-tables';
import type { TestApp } from './test-app';

/** What a test needs of a frame that has been rendered: its place, its pictures and the operator's decision. */
export interface RenderedFrame {
  rollId: number;
  /** 1-based frame number on the roll. */
  index: number;
  /** The scan's file name (default `scan-<index>.tif`). */
  fileName?: string;
  /** The renders stored for it, each the same flat JPEG (default: preview and JPEG). */
  outputs?: readonly FrameOutputKind[];
  /** Pixel size of the stored JPEG and of the frame (default 8×8). */
  size?: { width: number; height: number };
  /** Its colour, so frames of one roll differ where a test compares them (default mid grey). */
  colour?: string | { r: number; g: number; b: number };
  /** The operator's decision (none: nobody has reviewed it), by `reviewerId`, with `note`. */
  decision?: ReviewDecision | null;
  reviewerId?: number;
  note?: string;
}

/**
 * Writes a rendered frame straight to the tables, as the roll job leaves one: a stored JPEG as its scan and its
 * outputs, status done, and the review when one is given. Returns the frame's id.
 *
 * @example const id = await addRenderedFrame(t, { rollId, index: 1, decision: 'approved', reviewerId: operatorId });
 */
export async function addRenderedFrame(t: TestApp, frame: RenderedFrame): Promise<number> {
  const { width, height } = frame.size ?? { width: 8, height: 8 };
  const store = createFileStore(t.config.dataDir);
  const stored = await store.putBytes(
    await sharp({ create: { width, height, channels: 3, background: frame.colour ?? '#808080' } })
      .jpeg()
      .toBuffer(),
  );
  const at = t.clock.now();
  const iso = at.toISOString();
  const file = await recordFile(t.db, {
    sha256: stored.sha256,
    size: stored.size,
    mediaType: 'image/jpeg',
    at,
  });
  const row = await t.db
    .insertInto('frames')
    .values({
      roll_id: frame.rollId,
      frame_index: frame.index,
      source_file_id: file.id,
      file_name: frame.fileName ?? `scan-${frame.index}.tif`,
      width,
      height,
      bit_depth: 16,
      base_region: null,
      base_source: null,
      base_measured: null,
      adjustments: '{}',
      status: 'done',
      error: null,
      rendered_at: iso,
      created_at: iso,
    })
    .returning('id')
    .executeTakeFirstOrThrow();
  for (const kind of frame.outputs ?? (['preview', 'jpeg'] as const)) {
    await t.db
      .insertInto('frame_outputs')
      .values({ frame_id: row.id, kind, file_id: file.id, created_at: iso })
      .execute();
  }
  if (frame.decision) {
    if (frame.reviewerId === undefined) throw new Error('a reviewed test frame needs its reviewerId');
    await t.db
      .insertInto('frame_reviews')
      .values({
        frame_id: row.id,
        decision: frame.decision,
        note: frame.note ?? '',
        reviewed_by: frame.reviewerId,
        reviewed_at: iso,
      })
      .execute();
  }
  return row.id;
}
