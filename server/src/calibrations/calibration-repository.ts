import type {
  Calibration,
  CalibrationFit,
  CalibrationInputs,
  CalibrationListQuery,
  CalibrationResiduals,
  CalibrationSummary,
  CalibrationWarning,
} from '@clearbase/contracts';
import type { Kysely } from 'kysely';
import type { Database } from '../db/database';
import type { CalibrationRow } from './calibrations-table';

/** A calibration row with the names lists show beside it. */
export type CalibrationListRow = CalibrationRow & {
  stock_name: string;
  created_by_name: string | null;
  profile_id: number | null;
};

/**
 * Records a fitted calibration (no draft yet: `linkCalibrationToVersion` adds it in the same transaction).
 *
 * @example
 * const row = await insertCalibration(trx, { stockId: 3, scannerId: null, inputs, fit, residuals, warnings, at, by: 7 });
 */
export function insertCalibration(
  db: Kysely<Database>,
  c: {
    stockId: number;
    scannerId: number | null;
    inputs: CalibrationInputs;
    fit: CalibrationFit;
    residuals: CalibrationResiduals;
    warnings: CalibrationWarning[];
    at: Date;
    by: number | null;
  },
): Promise<CalibrationRow> {
  return db
    .insertInto('calibrations')
    .values({
      stock_id: c.stockId,
      scanner_id: c.scannerId,
      inputs: JSON.stringify(c.inputs),
      fitted: JSON.stringify(c.fit),
      residuals: JSON.stringify(c.residuals),
      warnings: JSON.stringify(c.warnings),
      profile_version_id: null,
      created_at: c.at.toISOString(),
      created_by: c.by,
    })
    .returningAll()
    .executeTakeFirstOrThrow();
}

/** Links a calibration and the draft version made from it, both ways. */
export async function linkCalibrationToVersion(
  db: Kysely<Database>,
  calibrationId: number,
  versionId: number,
): Promise<void> {
  await db
    .updateTable('calibrations')
    .set({ profile_version_id: versionId })
    .where('id', '=', calibrationId)
    .execute();
  await db
    .updateTable('profile_versions')
    .set({ calibration_id: calibrationId })
    .where('id', '=', versionId)
    .execute();
}

function listQuery(db: Kysely<Database>) {
  return db
    .selectFrom('calibrations')
    .innerJoin('stocks', 'stocks.id', 'calibrations.stock_id')
    .leftJoin('users', 'users.id', 'calibrations.created_by')
    .leftJoin('profile_versions', 'profile_versions.id', 'calibrations.profile_version_id')
    .selectAll('calibrations')
    .select([
      'stocks.name as stock_name',
      'users.name as created_by_name',
      'profile_versions.profile_id as profile_id',
    ]);
}

export function findCalibrationById(
  db: Kysely<Database>,
  id: number,
): Promise<CalibrationListRow | undefined> {
  return listQuery(db).where('calibrations.id', '=', id).executeTakeFirst();
}

/** Newest first, optionally of one stock or the one that made a given version. */
export function listCalibrations(
  db: Kysely<Database>,
  query: CalibrationListQuery = {},
): Promise<CalibrationListRow[]> {
  let q = listQuery(db);
  if (query.stockId !== undefined) q = q.where('calibrations.stock_id', '=', query.stockId);
  if (query.profileVersionId !== undefined)
    q = q.where('calibrations.profile_version_id', '=', query.profileVersionId);
  return q.orderBy('calibrations.id', 'desc').execute();
}

/**
 * A stored fit, with the figures older calibrations did not keep filled in as absent (null, empty, false), so every
 * record answers the same shape.
 */
export function readStoredFit(json: string): CalibrationFit {
  const stored = JSON.parse(json) as CalibrationFit;
  const d = stored.deltaE;
  return {
    ...stored,
    exposureMatrix: stored.exposureMatrix ?? null,
    deltaE: {
      ...d,
      patches: d.patches.map((p) => ({
        ...p,
        crossValidated: p.crossValidated ?? null,
        deltaECrossValidated: p.deltaECrossValidated ?? null,
      })),
      crossValidated: d.crossValidated ?? null,
      neutral: d.neutral ?? null,
      frames: d.frames ?? [],
      memorisedChart: d.memorisedChart ?? false,
    },
  };
}

export function toCalibrationSummary(row: CalibrationListRow): CalibrationSummary {
  const fit = readStoredFit(row.fitted);
  const warnings = JSON.parse(row.warnings) as CalibrationWarning[];
  return {
    id: row.id,
    stockId: row.stock_id,
    stockName: row.stock_name,
    scannerId: row.scanner_id,
    profileId: row.profile_id,
    profileVersionId: row.profile_version_id,
    gamma: fit.gamma,
    ei: fit.ei,
    meanDeltaE: fit.deltaE.after.mean,
    warningCount: warnings.filter((w) => w.severity === 'warning').length,
    createdAt: row.created_at,
    createdBy: row.created_by,
    createdByName: row.created_by_name,
  };
}

export function toCalibration(row: CalibrationListRow): Calibration {
  return {
    ...toCalibrationSummary(row),
    inputs: JSON.parse(row.inputs) as CalibrationInputs,
    fit: readStoredFit(row.fitted),
    residuals: JSON.parse(row.residuals) as CalibrationResiduals,
    warnings: JSON.parse(row.warnings) as CalibrationWarning[],
  };
}
