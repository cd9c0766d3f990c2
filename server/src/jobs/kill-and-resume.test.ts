import { spawn } from 'node:child_process';
import { existsSync, readdirSync } from 'node:fs';
import { createRequire } from 'node:module';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createFileStore } from '../files/file-store';
import { addTestCatalogue, negativeTiff } from '../orders/order-test-fixtures';
import { addUser, createTestApp, signedIn, type TestApp } from '../test-support/test-app';
import { createTestJobRunner } from '../test-support/create-test-job-runner';

const frameCount = 6;
let t: TestApp;
let roll: number;

async function until<T>(what: () => Promise<T | undefined | false>, ms = 60_000): Promise<T> {
  const end = Date.now() + ms;
  for (;;) {
    const v = await what();
    if (v) return v;
    if (Date.now() > end) throw new Error('timed out waiting');
    await new Promise((r) => setTimeout(r, 20));
  }
}

const doneFrames = async () =>
  t.db.selectFrom('frames').select(['id', 'rendered_at']).where('status', '=', 'done').execute();

beforeAll(async () => {
  t = await createTestApp();
  const customerId = await addUser(t.db, 'customer', 'cass@lab.test');
  await addUser(t.db, 'operator', 'oskar@lab.test');
  const { stockId } = await addTestCatalogue(t.db);
  const operator = await signedIn(t.app, 'oskar@lab.test');
  const order = (
    await operator.post('/api/orders', { customerId, outputFormats: ['jpeg', 'png16'] }).expect(201)
  ).body.id as number;
  roll = (
    await operator.post(`/api/orders/${order}/rolls`, { stockId, ei: 200, format: '135-36' }).expect(201)
  ).body.id as number;
  let req = operator.send('post', `/api/rolls/${roll}/frames`);
  for (let i = 1; i <= frameCount; i++)
    req = req.attach('files', await negativeTiff({ seed: i }), `f${i}.tif`);
  await req.expect(201);
  await operator.post(`/api/rolls/${roll}/invert`, {}).expect(202);
});
afterAll(() => t.close());

describe('a server killed mid-roll', () => {
  it('resumes on restart: every frame done exactly once, all outputs written, no temp files left', async () => {
    const tsx = createRequire(import.meta.url).resolve('tsx');
    const script = fileURLToPath(new URL('./queue-process.ts', import.meta.url));
    const child = spawn(process.execPath, ['--import', tsx, script], {
      env: {
        ...process.env,
        DATA_DIR: t.config.dataDir,
        DATABASE_FILE: join(t.config.dataDir, 'test.sqlite'),
        FRAME_DELAY_MS: '400',
        LEASE_MS: '1000',
      },
      stdio: ['ignore', 'pipe', 'inherit'],
    });
    const exited = new Promise<NodeJS.Signals | null>((resolve) =>
      child.on('exit', (_code, signal) => resolve(signal)),
    );
    await until(async () => (await doneFrames()).length >= 2);
    child.kill('SIGKILL');
    expect(await exited).toBe('SIGKILL');

    const before = await doneFrames();
    expect(before.length).toBeGreaterThanOrEqual(2);
    expect(before.length).toBeLessThan(frameCount);
    const job = await t.db.selectFrom('jobs').selectAll().executeTakeFirstOrThrow();
    expect(job.state).toBe('running');

    const resumed: number[] = [];
    const runner = createTestJobRunner(t, {
      leaseMs: 1000,
      afterFrame: (id) => {
        resumed.push(id);
      },
    });
    await runner.start();
    try {
      await until(async () => {
        const row = await t.db.selectFrom('jobs').select('state').executeTakeFirstOrThrow();
        return row.state === 'done';
      });
    } finally {
      await runner.stop();
    }

    const after = await doneFrames();
    expect(after).toHaveLength(frameCount);
    const earlier = new Set(before.map((f) => f.id));
    expect(resumed.filter((id) => earlier.has(id))).toEqual([]);
    expect(new Set([...earlier, ...resumed]).size).toBe(frameCount);
    expect(resumed.length).toBe(frameCount - before.length);
    for (const f of before) expect(after.find((a) => a.id === f.id)?.rendered_at).toBe(f.rendered_at);

    const finished = await t.db.selectFrom('jobs').selectAll().executeTakeFirstOrThrow();
    expect(finished).toMatchObject({
      state: 'done',
      attempts: 2,
      progress_done: frameCount,
      progress_failed: 0,
    });
    const outputs = await t.db
      .selectFrom('frame_outputs')
      .innerJoin('files', 'files.id', 'frame_outputs.file_id')
      .select(['frame_outputs.frame_id', 'frame_outputs.kind', 'files.sha256'])
      .execute();
    expect(outputs).toHaveLength(frameCount * 3);
    const store = createFileStore(t.config.dataDir);
    for (const o of outputs) expect(existsSync(store.pathOf(o.sha256))).toBe(true);
    expect(readdirSync(store.tmpDir)).toEqual([]);
    const rollRow = await t.db
      .selectFrom('rolls')
      .select('status')
      .where('id', '=', roll)
      .executeTakeFirstOrThrow();
    expect(rollRow.status).toBe('inverted');
  }, 120_000);
});
