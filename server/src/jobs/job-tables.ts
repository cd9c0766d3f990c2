import type { JobState } from '@clearbase/contracts';
import type { ColumnType, Generated, Selectable } from 'kysely';

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

export type JobRow = Selectable<JobsTable>;
