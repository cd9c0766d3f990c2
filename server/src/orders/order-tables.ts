import type { FrameStatus, JobState, OrderStatus, RollStatus } from '@clearbase/contracts';
import type { ColumnType, Generated, Selectable } from 'kysely';

/** A stored file, content-addressed by SHA-256 (DATA_DIR/files/ab/cdef…). */
export interface FilesTable {
  id: Generated<number>;
  sha256: string;
  size: number;
  media_type: string;
  created_at: ColumnType<string, string, never>;
}

/** A customer's order. */
export interface OrdersTable {
  id: Generated<number>;
  customer_id: number;
  status: OrderStatus;
  notes: ColumnType<string, string | undefined, string>;
  /** JSON array of output formats */
  output_formats: string;
  scan_size: string;
  /** JSON: what happens to the negatives, posted back to an address or collected at the lab */
  negatives: ColumnType<string, string | undefined, string>;
  /** JSON: the price list the order was placed under; null on orders placed before orders kept one */
  price_list: ColumnType<string | null, string | null | undefined, string | null>;
  created_at: ColumnType<string, string, never>;
  updated_at: string;
}

/** A roll of film of an order, pinned to one profile version. */
export interface RollsTable {
  id: Generated<number>;
  order_id: number;
  stock_id: number;
  ei: number;
  push_pull: number;
  format: string;
  scanner_id: number | null;
  profile_version_id: number;
  base_mode: ColumnType<'auto' | 'region', 'auto' | 'region' | undefined, 'auto' | 'region'>;
  base_frame_id: number | null;
  /** JSON pixel rectangle */
  base_region: string | null;
  /** JSON measured base */
  base_measured: string | null;
  /** JSON adjustments */
  adjustments: string;
  status: RollStatus;
  created_at: ColumnType<string, string, never>;
  updated_at: string;
}

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

/** A durable background job. */
export interface JobsTable {
  id: Generated<number>;
  kind: string;
  target: string;
  state: JobState;
  attempts: ColumnType<number, number | undefined, number>;
  /** JSON */
  payload: ColumnType<string, string | undefined, string>;
  progress_done: ColumnType<number, number | undefined, number>;
  progress_failed: ColumnType<number, number | undefined, number>;
  progress_total: ColumnType<number, number | undefined, number>;
  error: string | null;
  cancel_requested: ColumnType<number, number | undefined, number>;
  lease_until: string | null;
  created_by: number | null;
  created_at: ColumnType<string, string, never>;
  updated_at: string;
  started_at: string | null;
  finished_at: string | null;
}

/** The order, roll, frame, file and job tables, spread into the one `Database` interface. */
export interface OrderTables {
  files: FilesTable;
  orders: OrdersTable;
  rolls: RollsTable;
  frames: FramesTable;
  frame_outputs: FrameOutputsTable;
  jobs: JobsTable;
}

export type FileRow = Selectable<FilesTable>;
export type OrderRow = Selectable<OrdersTable>;
export type RollRow = Selectable<RollsTable>;
export type FrameRow = Selectable<FramesTable>;
export type FrameOutputRow = Selectable<FrameOutputsTable>;
export type JobRow = Selectable<JobsTable>;
