import type { RollStatus } from '@clearbase/contracts';
import type { ColumnType, Generated, Selectable } from 'kysely';

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

export type RollRow = Selectable<RollsTable>;
