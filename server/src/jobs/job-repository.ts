import type { Job, JobKind } from '@clearbase/contracts';
import { sql, type Kysely } from 'kysely';
import type { Database } from '../db/database';
import type { JobRow } from './job-tables';

/** The target text of a roll's inversion job. */
export const rollTarget = (rollId: number) => `roll:${rollId}`;

/** The roll a job works on, from its target `roll:<id>`. */
export function rollIdOfTarget(target: string): number | null {
  const m = /^roll:(\d+)$/.exec(target);
  return m ? Number(m[1]) : null;
}

export function findJobById(db: Kysely<Database>, id: number): Promise<JobRow | undefined> {
  return db.selectFrom('jobs').selectAll().where('id', '=', id).executeTakeFirst();
}

/** The newest job on a target, whatever its state. */
export function latestJobOf(db: Kysely<Database>, target: string): Promise<JobRow | undefined> {
  return db
    .selectFrom('jobs')
    .selectAll()
    .where('target', '=', target)
    .orderBy('id', 'desc')
    .limit(1)
    .executeTakeFirst();
}

/** The queued or running job on a target, if any. */
export function activeJobOf(db: Kysely<Database>, target: string): Promise<JobRow | undefined> {
  return db
    .selectFrom('jobs')
    .selectAll()
    .where('target', '=', target)
    .where('state', 'in', ['queued', 'running'])
    .orderBy('id', 'desc')
    .limit(1)
    .executeTakeFirst();
}

export function insertJob(
  db: Kysely<Database>,
  job: { kind: JobKind; target: string; payload: object; total: number; by: number | null; at: Date },
): Promise<JobRow> {
  const at = job.at.toISOString();
  return db
    .insertInto('jobs')
    .values({
      kind: job.kind,
      target: job.target,
      state: 'queued',
      payload: JSON.stringify(job.payload),
      progress_total: job.total,
      error: null,
      lease_until: null,
      created_by: job.by,
      created_at: at,
      updated_at: at,
      started_at: null,
      finished_at: null,
    })
    .returningAll()
    .executeTakeFirstOrThrow();
}

/**
 * Takes the oldest queued job for this process: marks it running with a lease until `leaseUntil` and counts the
 * attempt, in one statement, so two runners never take the same job.
 */
export function claimNextJob(db: Kysely<Database>, now: Date, leaseUntil: Date): Promise<JobRow | undefined> {
  return db
    .updateTable('jobs')
    .set((eb) => ({
      state: 'running',
      attempts: eb('attempts', '+', 1),
      lease_until: leaseUntil.toISOString(),
      started_at: sql<string>`coalesce(started_at, ${now.toISOString()})`,
      updated_at: now.toISOString(),
    }))
    .where('id', '=', (eb) =>
      eb.selectFrom('jobs').select('id').where('state', '=', 'queued').orderBy('id').limit(1),
    )
    .where('state', '=', 'queued')
    .returningAll()
    .executeTakeFirst();
}

/** Running jobs whose lease ran out (their process died) go back to the queue. Returns how many. */
export async function requeueExpired(db: Kysely<Database>, now: Date): Promise<number> {
  const result = await db
    .updateTable('jobs')
    .set({ state: 'queued', lease_until: null, updated_at: now.toISOString() })
    .where('state', '=', 'running')
    .where('lease_until', '<', now.toISOString())
    .executeTakeFirst();
  return Number(result.numUpdatedRows);
}

export async function renewLease(db: Kysely<Database>, id: number, leaseUntil: Date): Promise<void> {
  await db
    .updateTable('jobs')
    .set({ lease_until: leaseUntil.toISOString() })
    .where('id', '=', id)
    .where('state', '=', 'running')
    .execute();
}

export function updateJob(
  db: Kysely<Database>,
  id: number,
  changes: Partial<Pick<JobRow, 'state' | 'error' | 'lease_until' | 'finished_at' | 'cancel_requested'>> & {
    progress?: { done: number; failed: number; total: number };
  },
  at: Date,
): Promise<JobRow | undefined> {
  const { progress, ...rest } = changes;
  return db
    .updateTable('jobs')
    .set({
      ...rest,
      ...(progress
        ? { progress_done: progress.done, progress_failed: progress.failed, progress_total: progress.total }
        : {}),
      updated_at: at.toISOString(),
    })
    .where('id', '=', id)
    .returningAll()
    .executeTakeFirst();
}

/** Counts one more frame of the job done, or failed for good. */
export function countFrameOfJob(
  db: Kysely<Database>,
  id: number,
  outcome: 'done' | 'failed',
  at: Date,
): Promise<JobRow> {
  return db
    .updateTable('jobs')
    .set((eb) =>
      outcome === 'done'
        ? { progress_done: eb('progress_done', '+', 1), updated_at: at.toISOString() }
        : { progress_failed: eb('progress_failed', '+', 1), updated_at: at.toISOString() },
    )
    .where('id', '=', id)
    .returningAll()
    .executeTakeFirstOrThrow();
}

export function toJob(row: JobRow): Job {
  return {
    id: row.id,
    kind: row.kind as JobKind,
    target: row.target,
    state: row.state,
    attempts: row.attempts,
    progress: { done: row.progress_done, failed: row.progress_failed, total: row.progress_total },
    error: row.error,
    createdAt: row.created_at,
    startedAt: row.started_at,
    finishedAt: row.finished_at,
  };
}
