import PQueue from 'p-queue';
import { pino } from 'pino';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createFilmBaseService } from '../film-base/film-base-service';
import { createFileStore } from '../files/file-store';
import { createInversionPool, type InversionPool } from '../inversion-pool/inversion-pool';
import { addRollWithScans } from '../orders/order-test-fixtures';
import type { JobRow } from './job-tables';
import { findRollById } from '../rolls/roll-repository';
import { createTestApp, type TestApp } from '../test-support/test-app';
import { addTestLab, type TestLab } from '../test-support/test-lab';
import { findJobById, insertJob, rollTarget } from './job-repository';
import { createRollJob } from './roll-job';

let t: TestApp;
let lab: TestLab;
let pool: InversionPool | undefined;
let stopping = false;
const rendered: number[] = [];

const rollJob = () => {
  const store = createFileStore(t.config.dataDir);
  return createRollJob({
    db: t.db,
    config: t.config,
    clock: t.clock,
    logger: pino({ level: 'silent' }),
    store,
    filmBase: createFilmBaseService({
      db: t.db,
      store,
      clock: t.clock,
      maxPixels: t.config.uploads.maxPixels,
    }),
    frames: new PQueue({ concurrency: 1 }),
    pool: () => (pool ??= createInversionPool({ threads: 1 })),
    stopping: () => stopping,
    publishJob: () => undefined,
    afterFrame: (frameId) => void rendered.push(frameId),
  });
};

/** A running inversion job on the roll, as the queue hands it to the roll job. */
async function runningJob(roll: number, total: number): Promise<JobRow> {
  const job = await insertJob(t.db, {
    kind: 'invert-roll',
    target: rollTarget(roll),
    payload: {},
    total,
    by: null,
    at: t.clock.now(),
  });
  await t.db.updateTable('jobs').set({ state: 'running', attempts: 1 }).where('id', '=', job.id).execute();
  return (await findJobById(t.db, job.id))!;
}

const framesOf = (roll: number) =>
  t.db.selectFrom('frames').selectAll().where('roll_id', '=', roll).orderBy('frame_index').execute();
const outputKinds = async (frameId: number) =>
  (
    await t.db
      .selectFrom('frame_outputs')
      .select('kind')
      .where('frame_id', '=', frameId)
      .orderBy('kind')
      .execute()
  ).map((o) => o.kind);

beforeAll(async () => {
  t = await createTestApp();
  lab = await addTestLab(t);
});
afterAll(async () => {
  await pool?.close();
  await t.close();
});

describe('the roll job', () => {
  it('renders the frames left queued or half-inverted, each once, skips those done, and counts them', async () => {
    const { roll, frames } = await addRollWithScans(lab.operator, {
      customerId: lab.customerId,
      stockId: lab.stockId,
      scans: [
        { name: 'a.tif', seed: 1 },
        { name: 'b.tif', seed: 2 },
        { name: 'c.tif', seed: 3 },
      ],
    });
    // as a process killed mid-roll leaves it: one frame done, one being inverted, one still queued
    await t.db.updateTable('frames').set({ status: 'done' }).where('id', '=', frames[0]!).execute();
    await t.db
      .updateTable('frames')
      .set({ status: 'inverting', attempts: 1 })
      .where('id', '=', frames[1]!)
      .execute();
    const job = await runningJob(roll, 2);
    rendered.length = 0;

    const answered = await rollJob().render(job);

    expect(answered.id).toBe(roll);
    expect(rendered).toEqual([frames[1], frames[2]]);
    const after = await framesOf(roll);
    expect(after.map((f) => [f.status, f.base_source])).toEqual([
      ['done', null],
      ['done', 'frame'],
      ['done', 'frame'],
    ]);
    expect(after.map((f) => f.attempts)).toEqual([0, 2, 1]);
    expect(await outputKinds(frames[0]!)).toEqual([]);
    expect(await outputKinds(frames[2]!)).toEqual(['jpeg', 'preview']);
    expect((await findJobById(t.db, job.id))!.progress_done).toBe(2);
  });

  it('fails a frame with no film base at once, flagged for QC, and leaves its roll needing attention', async () => {
    const { roll, frames } = await addRollWithScans(lab.operator, {
      customerId: lab.customerId,
      stockId: lab.stockId,
      scans: [{ name: 'a.tif', seed: 4 }],
    });
    await t.db.updateTable('frames').set({ base_measured: null }).where('id', '=', frames[0]!).execute();
    const job = await runningJob(roll, 1);
    const roller = rollJob();

    const rollRow = await roller.render(job);
    await roller.finished(rollRow, t.clock.now());

    const [frame] = await framesOf(roll);
    expect(frame).toMatchObject({ status: 'failed', attempts: 1, qc_flags: '["no-base"]' });
    expect(frame!.error).toBe(
      'No usable film base in this frame nor on the roll; draw the base by hand over the rebate or leader.',
    );
    expect((await findJobById(t.db, job.id))!).toMatchObject({ progress_done: 0, progress_failed: 1 });
    expect((await findRollById(t.db, roll))!.status).toBe('needs-attention');
  });

  it('starts no frame while the server is stopping, or once the job is cancelled', async () => {
    const { roll } = await addRollWithScans(lab.operator, {
      customerId: lab.customerId,
      stockId: lab.stockId,
      scans: [{ name: 'a.tif', seed: 5 }],
    });
    const job = await runningJob(roll, 1);
    stopping = true;
    try {
      await rollJob().render(job);
    } finally {
      stopping = false;
    }
    await t.db.updateTable('jobs').set({ cancel_requested: 1 }).where('id', '=', job.id).execute();
    await rollJob().render(job);
    expect((await framesOf(roll)).map((f) => [f.status, f.attempts])).toEqual([['queued', 0]]);
  });
});
