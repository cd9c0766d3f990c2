import type { ColumnType, Generated, Selectable } from 'kysely';

/** A calibration roll fitted into a draft profile. JSON columns hold the contracts' shapes. */
export interface CalibrationsTable {
  id: Generated<number>;
  stock_id: number;
  scanner_id: number | null;
  /** JSON CalibrationInputs */
  inputs: string;
  /** JSON CalibrationFit */
  fitted: string;
  /** JSON CalibrationResiduals */
  residuals: string;
  /** JSON array of CalibrationWarning */
  warnings: string;
  profile_version_id: number | null;
  created_at: ColumnType<string, string, never>;
  created_by: number | null;
}

export type CalibrationRow = Selectable<CalibrationsTable>;
