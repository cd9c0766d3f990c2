import type { Kysely } from 'kysely';
import sharp from 'sharp';
import type { Database } from '../db/database';
import { recordFile } from '../files/file-repository';
import type { FileStore } from '../files/file-store';
import type { FrameRow } from './frame-tables';
import { frameSourcePath } from './frame-negative';
import { findFrameOutput, putFrameOutput } from './frame-repository';

/** Long edge of the previews, pixels: sharp enough for a full-screen view, small enough to load fast (our choice). */
export const previewLongEdge = 2048;
// JPEG quality 85 for a look at the negative, not for delivery: common practice for web previews, from memory
const negativePreviewQuality = 85;

/**
 * The negative as scanned, reduced to a JPEG preview of long edge `previewLongEdge`: made on first request, kept in
 * the store and recorded as the frame's `negative-preview`, then read from there.
 *
 * @example const { sha256, media_type } = await negativePreviewOf(db, store, frame, clock.now());
 */
export async function negativePreviewOf(
  db: Kysely<Database>,
  store: FileStore,
  frame: FrameRow,
  at: Date,
): Promise<{ sha256: string; media_type: string }> {
  const known = await findFrameOutput(db, frame.id, 'negative-preview');
  if (known) return known;
  const bytes = await sharp(await frameSourcePath(db, store, frame))
    .resize(previewLongEdge, previewLongEdge, { fit: 'inside', withoutEnlargement: true })
    .toColourspace('srgb')
    .jpeg({ quality: negativePreviewQuality })
    .toBuffer();
  const stored = await store.putBytes(bytes);
  await db.transaction().execute(async (trx) => {
    const file = await recordFile(trx, {
      sha256: stored.sha256,
      size: stored.size,
      mediaType: 'image/jpeg',
      at,
    });
    await putFrameOutput(trx, { frameId: frame.id, kind: 'negative-preview', fileId: file.id, at });
  });
  return { sha256: stored.sha256, media_type: 'image/jpeg' };
}
