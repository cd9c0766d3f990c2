import type { FrameStatus } from '@clearbase/contracts';
import type { ColumnType, Generated, Selectable } from 'kysely';

/** One negative scan of a roll. */
export interface FramesTable {
  id: Generated<number>;
  roll_id: number;
  frame_index: number;
  source_file_id: number;
  file_name: string;
  width: number;
  height: number;
  bit_depth: 8 | 16;
  base_mode: ColumnType<'auto' | 'region', 'auto' | 'region' | undefined, 'auto' | 'region'>;
  base_region: string | null;
  base_source: 'frame' | 'region' | 'roll' | null;
  base_measured: string | null;
  adjustments: string;
  status: FrameStatus;
  /** JSON array of QC flags */
  qc_flags: ColumnType<string, string | undefined, string>;
  /** JSON array of warnings */
  warnings: ColumnType<string, string | undefined, string>;
  attempts: ColumnType<number, number | undefined, number>;
  error: string | null;
  rendered_at: string | null;
  created_at: ColumnType<string, string, never>;
}

/** What a frame's renders are: previews and the full-size outputs. */
export type FrameOutputKind = 'preview' | 'negative-preview' | 'jpeg' | 'tiff16' | 'png16';

export interface FrameOutputsTable {
  frame_id: number;
  kind: FrameOutputKind;
  file_id: number;
  created_at: string;
}

export type FrameRow = Selectable<FramesTable>;
export type FrameOutputRow = Selectable<FrameOutputsTable>;
