import type { User } from '@clearbase/contracts';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { listFramesOfRoll } from '../frames/frame-repository';
import { addRollWithScans } from '../orders/order-test-fixtures';
import { findRollById } from '../rolls/roll-repository';
import { addUser, createTestApp, type TestApp } from '../test-support/test-app';
import { addTestLab, type TestLab } from '../test-support/test-lab';
import { findUserById, toUser } from '../users/user-repository';
import { createInversionService, type InversionService } from './inversion-service';
import { findJobById } from './job-repository';

let t: TestApp;
let lab: TestLab;
let inversion: InversionService;
let operator: User;
let stranger: User;

const rollOf = (scans: number) =>
  addRollWithScans(lab.operator, {
    customerId: lab.customerId,
    stockId: lab.stockId,
    scans: Array.from({ length: scans }, (_, i) => ({ name: `f${i}.tif`, seed: i + 1 })),
  });
const audits = (action: string) =>
  t.db.selectFrom('audit_log').selectAll().where('action', '=', action).orderBy('id').execute();

beforeAll(async () => {
  t = await createTestApp();
  lab = await addTestLab(t);
  const user = async (id: number) => toUser((await findUserById(t.db, id))!);
  operator = await user(await addUser(t.db, 'operator', 'second-operator@lab.test'));
  stranger = await user(await addUser(t.db, 'customer', 'other@lab.test'));
  inversion = createInversionService({ db: t.db, clock: t.clock });
});
afterAll(() => t.close());

describe('inversion service', () => {
  it('queues the frames not done yet, marks the roll inverting, audits it, and answers the same job when asked again', async () => {
    const { roll, frames } = await rollOf(3);
    await t.db
      .updateTable('frames')
      .set({ status: 'done', attempts: 1 })
      .where('id', '=', frames[0]!)
      .execute();
    await t.db
      .updateTable('frames')
      .set({ status: 'failed', attempts: 3 })
      .where('id', '=', frames[1]!)
      .execute();

    const job = await inversion.start(operator, roll, { frames: 'pending', levels: 'roll' });
    const again = await inversion.start(operator, roll, { frames: 'all', levels: 'frame' });

    expect(job).toMatchObject({ kind: 'invert-roll', target: `roll:${roll}`, state: 'queued' });
    expect(job.progress).toEqual({ done: 0, failed: 0, total: 2 });
    expect(again.id).toBe(job.id);
    expect((await listFramesOfRoll(t.db, roll)).map((f) => [f.status, f.attempts])).toEqual([
      ['done', 1],
      ['queued', 0],
      ['queued', 0],
    ]);
    expect(JSON.parse((await findJobById(t.db, job.id))!.payload)).toEqual({
      rollId: roll,
      frames: 'pending',
      levels: 'roll',
    });
    expect((await findRollById(t.db, roll))!.status).toBe('inverting');
    const [audit] = await audits('inversion-started');
    expect(JSON.parse(audit!.details!)).toEqual({
      jobId: job.id,
      frames: 'pending',
      levels: 'roll',
      count: 2,
    });
  });

  it('queues every frame again when asked for all', async () => {
    const { roll } = await rollOf(2);
    await t.db.updateTable('frames').set({ status: 'done' }).where('roll_id', '=', roll).execute();
    const job = await inversion.start(operator, roll, { frames: 'all', levels: 'frame' });
    expect(job.progress.total).toBe(2);
    expect((await listFramesOfRoll(t.db, roll)).every((f) => f.status === 'queued')).toBe(true);
  });

  it('records the roll’s EI on a job at the metered exposure, so a resumed job renders at the EI it began with', async () => {
    const { roll } = await rollOf(1);
    const job = await inversion.start(operator, roll, { frames: 'pending', levels: 'metered' });
    expect(JSON.parse((await findJobById(t.db, job.id))!.payload)).toMatchObject({
      levels: 'metered',
      exposureIndex: 200,
    });
  });

  it('refuses a roll with no scans, and another customer’s roll as if it did not exist', async () => {
    const { roll } = await lab.newRoll();
    await expect(
      inversion.start(operator, roll, { frames: 'pending', levels: 'frame' }),
    ).rejects.toMatchObject({
      code: 'roll-has-no-frames',
      status: 409,
    });
    await expect(
      inversion.start(stranger, roll, { frames: 'pending', levels: 'frame' }),
    ).rejects.toMatchObject({
      code: 'roll-not-found',
      status: 404,
    });
  });

  it('cancels a queued job at once and its roll goes back to scanned; a finished job cannot be cancelled', async () => {
    const { roll } = await rollOf(1);
    const job = await inversion.start(operator, roll, { frames: 'pending', levels: 'frame' });

    const cancelled = await inversion.cancel(operator, job.id);

    expect(cancelled).toMatchObject({ id: job.id, state: 'cancelled' });
    expect(cancelled.finishedAt).not.toBeNull();
    expect((await findRollById(t.db, roll))!.status).toBe('scanned');
    await expect(inversion.cancel(operator, job.id)).rejects.toMatchObject({
      code: 'job-finished',
      status: 409,
    });
    await expect(inversion.cancel(operator, job.id + 1000)).rejects.toMatchObject({
      code: 'job-not-found',
      status: 404,
    });
    expect(await inversion.find(job.id)).toEqual(cancelled);
  });

  it('asks a running job to stop after the frame in hand, leaving it running', async () => {
    const { roll } = await rollOf(1);
    const job = await inversion.start(operator, roll, { frames: 'pending', levels: 'frame' });
    await t.db.updateTable('jobs').set({ state: 'running' }).where('id', '=', job.id).execute();

    const asked = await inversion.cancel(operator, job.id);

    expect(asked.state).toBe('running');
    expect((await findJobById(t.db, job.id))!.cancel_requested).toBe(1);
    expect((await findRollById(t.db, roll))!.status).toBe('inverting');
    expect((await audits('inversion-cancelled')).map((a) => JSON.parse(a.details!).state)).toEqual([
      'queued',
      'running',
    ]);
  });
});
