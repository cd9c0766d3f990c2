import { truncateSync } from 'node:fs';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createFileStore } from '../files/file-store';
import { addTestCatalogue, negativeTiff } from '../orders/order-test-fixtures';
import { addUser, createTestApp, signedIn, type Client, type TestApp } from '../test-support/test-app';
import { createTestJobRunner } from '../test-support/create-test-job-runner';
import type { JobRunner } from './job-runner';
import { maxFrameAttempts } from './roll-job';

let t: TestApp;
let operator: Client;
let stockId: number;
let customerId: number;
let seed = 0;
const started: JobRunner[] = [];

async function rollWithFrames(n: number): Promise<{ roll: number; frames: number[] }> {
  const order = (await operator.post('/api/orders', { customerId }).expect(201)).body.id as number;
  const roll = (
    await operator.post(`/api/orders/${order}/rolls`, { stockId, ei: 200, format: '135-36' }).expect(201)
  ).body.id as number;
  let req = operator.send('post', `/api/rolls/${roll}/frames`);
  for (let i = 1; i <= n; i++) req = req.attach('files', await negativeTiff({ seed: ++seed }), `f${i}.tif`);
  const res = await req.expect(201);
  return { roll, frames: res.body.accepted.map((a: { frameId: number }) => a.frameId) };
}

function runner(afterFrame?: (frameId: number) => Promise<void>): JobRunner {
  const r = createTestJobRunner(t, afterFrame ? { afterFrame } : {});
  started.push(r);
  return r;
}

async function jobSettled(roll: number) {
  const end = Date.now() + 30_000;
  for (;;) {
    const { body } = await operator.get(`/api/rolls/${roll}`).expect(200);
    if (body.job && ['done', 'failed', 'cancelled'].includes(body.job.state)) return body;
    if (Date.now() > end) throw new Error('job did not settle');
    await new Promise((r) => setTimeout(r, 25));
  }
}

beforeAll(async () => {
  t = await createTestApp();
  customerId = await addUser(t.db, 'customer', 'cass@lab.test');
  await addUser(t.db, 'operator', 'oskar@lab.test');
  ({ stockId } = await addTestCatalogue(t.db));
  operator = await signedIn(t.app, 'oskar@lab.test');
});
afterAll(async () => {
  for (const r of started) await r.stop();
  await t.close();
});

describe('frames that cannot be rendered', () => {
  it('marks a frame failed with its error after three tries while the rest of the roll finishes', async () => {
    const { roll, frames } = await rollWithFrames(3);
    const file = await t.db
      .selectFrom('frames')
      .innerJoin('files', 'files.id', 'frames.source_file_id')
      .select('files.sha256')
      .where('frames.id', '=', frames[1]!)
      .executeTakeFirstOrThrow();
    // the stored scan is damaged on disk after upload
    truncateSync(createFileStore(t.config.dataDir).pathOf(file.sha256), 200);
    await runner().start();
    await operator.post(`/api/rolls/${roll}/invert`, {}).expect(202);
    const detail = await jobSettled(roll);
    expect(detail.job).toMatchObject({ state: 'done', progress: { done: 2, failed: 1, total: 3 } });
    const failed = detail.frames.find((f: { id: number }) => f.id === frames[1]);
    expect(failed).toMatchObject({ status: 'failed', attempts: maxFrameAttempts });
    expect(failed.error).toContain('incomplete or damaged');
    expect(detail.frames.filter((f: { status: string }) => f.status === 'done')).toHaveLength(2);
    expect(detail.roll.status).toBe('needs-attention');
    await started.pop()!.stop();
  });

  it('stops a running job between frames when cancelled, leaving the rest queued', async () => {
    const { roll } = await rollWithFrames(3);
    let jobId = 0;
    const r = runner(async () => {
      if (jobId) await operator.post(`/api/jobs/${jobId}/cancel`).expect(202);
      jobId = 0;
    });
    jobId = (await operator.post(`/api/rolls/${roll}/invert`, {}).expect(202)).body.id as number;
    await r.start();
    const detail = await jobSettled(roll);
    expect(detail.job.state).toBe('cancelled');
    expect(detail.frames.map((f: { status: string }) => f.status)).toEqual(['done', 'queued', 'queued']);
    expect(detail.roll.status).toBe('scanned');
  });
});
