import type {
  Adjustments,
  Frame,
  MeasuredBase,
  OutputFormat,
  PixelRegion,
  QcFlag,
} from '@clearbase/contracts';
import { outputFormats, readStoredAdjustments } from '@clearbase/contracts';
import type { Kysely } from 'kysely';
import type { Database } from '../db/database';
import type { FrameOutputKind, FrameRow } from './frame-tables';

export function findFrameById(db: Kysely<Database>, id: number): Promise<FrameRow | undefined> {
  return db.selectFrom('frames').selectAll().where('id', '=', id).executeTakeFirst();
}

export function listFramesOfRoll(db: Kysely<Database>, rollId: number): Promise<FrameRow[]> {
  return db.selectFrom('frames').selectAll().where('roll_id', '=', rollId).orderBy('frame_index').execute();
}

export async function nextFrameIndex(db: Kysely<Database>, rollId: number): Promise<number> {
  const { top } = await db
    .selectFrom('frames')
    .select((eb) => eb.fn.max('frame_index').as('top'))
    .where('roll_id', '=', rollId)
    .executeTakeFirstOrThrow();
  return Number(top ?? 0) + 1;
}

/** The frame of this roll made from these stored bytes, if any (the same scan uploaded twice). */
export function findFrameOfRollByFile(
  db: Kysely<Database>,
  rollId: number,
  fileId: number,
): Promise<FrameRow | undefined> {
  return db
    .selectFrom('frames')
    .selectAll()
    .where('roll_id', '=', rollId)
    .where('source_file_id', '=', fileId)
    .executeTakeFirst();
}

export function insertFrame(
  db: Kysely<Database>,
  frame: {
    rollId: number;
    index: number;
    sourceFileId: number;
    fileName: string;
    width: number;
    height: number;
    bitDepth: 8 | 16;
    warnings: string[];
    adjustments: Adjustments;
    at: Date;
  },
): Promise<FrameRow> {
  return db
    .insertInto('frames')
    .values({
      roll_id: frame.rollId,
      frame_index: frame.index,
      source_file_id: frame.sourceFileId,
      file_name: frame.fileName,
      width: frame.width,
      height: frame.height,
      bit_depth: frame.bitDepth,
      base_region: null,
      base_source: null,
      base_measured: null,
      adjustments: JSON.stringify(frame.adjustments),
      status: 'queued',
      warnings: JSON.stringify(frame.warnings),
      error: null,
      rendered_at: null,
      created_at: frame.at.toISOString(),
    })
    .returningAll()
    .executeTakeFirstOrThrow();
}

/** The stored file of one of a frame's renders, if it has been made. */
export async function findFrameOutput(
  db: Kysely<Database>,
  frameId: number,
  kind: FrameOutputKind,
): Promise<{ sha256: string; media_type: string } | undefined> {
  return db
    .selectFrom('frame_outputs')
    .innerJoin('files', 'files.id', 'frame_outputs.file_id')
    .select(['files.sha256', 'files.media_type'])
    .where('frame_outputs.frame_id', '=', frameId)
    .where('frame_outputs.kind', '=', kind)
    .executeTakeFirst();
}

/** Full-size outputs a 1:1 view is cut from, best first: the lossless 16-bit ones, then the JPEG. */
const fullSizeKinds = ['png16', 'tiff16', 'jpeg'] as const;

/** A frame's best full-size output (`fullSizeKinds`, best first), if it has one. */
export async function findFullSizeOutput(
  db: Kysely<Database>,
  frameId: number,
): Promise<{ sha256: string; media_type: string } | undefined> {
  for (const kind of fullSizeKinds) {
    const output = await findFrameOutput(db, frameId, kind);
    if (output) return output;
  }
  return undefined;
}

/** Records (or replaces) one render of a frame. */
export async function putFrameOutput(
  db: Kysely<Database>,
  output: { frameId: number; kind: FrameOutputKind; fileId: number; at: Date },
): Promise<void> {
  await db
    .insertInto('frame_outputs')
    .values({
      frame_id: output.frameId,
      kind: output.kind,
      file_id: output.fileId,
      created_at: output.at.toISOString(),
    })
    .onConflict((oc) =>
      oc
        .columns(['frame_id', 'kind'])
        .doUpdateSet({ file_id: output.fileId, created_at: output.at.toISOString() }),
    )
    .execute();
}

/** Which full-size formats each frame has ready. */
export async function outputFormatsOfFrames(
  db: Kysely<Database>,
  frameIds: readonly number[],
): Promise<Map<number, OutputFormat[]>> {
  const map = new Map<number, OutputFormat[]>();
  if (frameIds.length === 0) return map;
  const rows = await db
    .selectFrom('frame_outputs')
    .select(['frame_id', 'kind'])
    .where('frame_id', 'in', frameIds)
    .where('kind', 'in', [...outputFormats])
    .execute();
  for (const r of rows) map.set(r.frame_id, [...(map.get(r.frame_id) ?? []), r.kind as OutputFormat]);
  return map;
}

/** Stores a frame's own adjustments; `requeue` puts it back in the queue, its tries counted afresh, to render again. */
export async function saveFrameAdjustments(
  db: Kysely<Database>,
  id: number,
  adjustments: Adjustments,
  options: { requeue: boolean },
): Promise<void> {
  await db
    .updateTable('frames')
    .set({
      adjustments: JSON.stringify(adjustments),
      ...(options.requeue ? { status: 'queued' as const, attempts: 0, error: null } : {}),
    })
    .where('id', '=', id)
    .execute();
}

/** Puts these frames back in the queue to render again, their tries and last error cleared. */
export async function requeueFrames(db: Kysely<Database>, ids: readonly number[]): Promise<void> {
  if (ids.length === 0) return;
  await db
    .updateTable('frames')
    .set({ status: 'queued', attempts: 0, error: null })
    .where('id', 'in', ids)
    .execute();
}

/**
 * Puts a roll's frames back in the queue to render again, but for those being inverted: the job in hand renders them
 * with what it read.
 */
export async function requeueFramesOfRoll(db: Kysely<Database>, rollId: number): Promise<void> {
  await db
    .updateTable('frames')
    .set({ status: 'queued', attempts: 0, error: null })
    .where('roll_id', '=', rollId)
    .where('status', '!=', 'inverting')
    .execute();
}

/** Marks a frame as being inverted, counting the try. */
export function markFrameInverting(db: Kysely<Database>, id: number, attempt: number): Promise<FrameRow> {
  return db
    .updateTable('frames')
    .set({ status: 'inverting', attempts: attempt })
    .where('id', '=', id)
    .returningAll()
    .executeTakeFirstOrThrow();
}

/** Marks a frame rendered, with the QC flags of its render and where the base it rendered with came from. */
export function markFrameDone(
  db: Kysely<Database>,
  id: number,
  done: { qcFlags: QcFlag[]; baseSource: NonNullable<FrameRow['base_source']>; at: Date },
): Promise<FrameRow> {
  return db
    .updateTable('frames')
    .set({
      status: 'done',
      qc_flags: JSON.stringify(done.qcFlags),
      base_source: done.baseSource,
      error: null,
      rendered_at: done.at.toISOString(),
    })
    .where('id', '=', id)
    .returningAll()
    .executeTakeFirstOrThrow();
}

/**
 * Records a failed try at a frame with its error: failed for good when `final`, else back in the queue. `qcFlags`,
 * when given, replace the frame's flags.
 */
export function markFrameTryFailed(
  db: Kysely<Database>,
  id: number,
  failure: { final: boolean; error: string; qcFlags?: QcFlag[] },
): Promise<FrameRow> {
  return db
    .updateTable('frames')
    .set({
      status: failure.final ? 'failed' : 'queued',
      error: failure.error,
      ...(failure.qcFlags ? { qc_flags: JSON.stringify(failure.qcFlags) } : {}),
    })
    .where('id', '=', id)
    .returningAll()
    .executeTakeFirstOrThrow();
}

const parse = <T>(text: string | null): T | null => (text === null ? null : (JSON.parse(text) as T));

export function toFrame(row: FrameRow, outputs: OutputFormat[] = []): Frame {
  return {
    id: row.id,
    rollId: row.roll_id,
    index: row.frame_index,
    fileName: row.file_name,
    width: row.width,
    height: row.height,
    bitDepth: row.bit_depth,
    status: row.status,
    qcFlags: JSON.parse(row.qc_flags) as QcFlag[],
    base: {
      mode: row.base_mode,
      region: parse<PixelRegion>(row.base_region),
      source: row.base_source,
      measured: parse<MeasuredBase>(row.base_measured),
    },
    adjustments: readStoredAdjustments(row.adjustments),
    attempts: row.attempts,
    error: row.error,
    warnings: JSON.parse(row.warnings) as string[],
    outputs: outputFormats.filter((f) => outputs.includes(f)),
    renderedAt: row.rendered_at,
    createdAt: row.created_at,
  };
}
