import type { Kysely } from 'kysely';
import type { Database } from '../db/database';
import type { FileStore } from '../files/file-store';
import { findFileById } from '../files/file-repository';
import { readNegative, type NegativeImage } from '../imaging/index';
import type { FrameRow } from './frame-tables';

/** A frame's negative scan: its SHA-256 and where it is stored. */
export async function frameSourceFile(
  db: Kysely<Database>,
  store: FileStore,
  frame: FrameRow,
): Promise<{ sha256: string; path: string }> {
  const file = await findFileById(db, frame.source_file_id);
  if (!file) throw new Error(`frame ${frame.id} points at missing file ${frame.source_file_id}`);
  return { sha256: file.sha256, path: store.pathOf(file.sha256) };
}

/** Where a frame's negative scan is stored. */
export async function frameSourcePath(
  db: Kysely<Database>,
  store: FileStore,
  frame: FrameRow,
): Promise<string> {
  return (await frameSourceFile(db, store, frame)).path;
}

/** Decodes a frame's negative scan. */
export async function frameNegative(
  db: Kysely<Database>,
  store: FileStore,
  frame: FrameRow,
  maxPixels: number,
): Promise<NegativeImage> {
  return readNegative(await frameSourcePath(db, store, frame), { maxPixels });
}
