import { readdirSync } from 'node:fs';
import { mkdtemp, readFile, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { flatTiff } from '../imaging/tiff-test-fixtures';
import { createTestApp, type TestApp } from '../test-support/test-app';
import { addTestLab, type TestLab } from '../test-support/test-lab';

let t: TestApp;
let lab: TestLab;
let dir: string;

beforeAll(async () => {
  // the smallest budget allowed, below one scan's decoded bytes: each scan is validated alone
  t = await createTestApp({ UPLOAD_VALIDATION_MEMORY_MB: '64' });
  lab = await addTestLab(t);
  dir = await mkdtemp(join(tmpdir(), 'clearbase-budget-'));
});
afterAll(async () => {
  await t.close();
  await rm(dir, { recursive: true, force: true });
});

describe('uploads beyond the validation budget', () => {
  it('are each judged in their turn and all kept, the temp folder left empty', async () => {
    // 4000 × 3000 16-bit RGB: 72 MB once decoded, more than the 64 MB budget; a few hundred KB on disk
    const scans = await Promise.all(
      [0, 1, 2].map(async (i) => readFile(await flatTiff(join(dir, `scan-${i}.tif`), 4000, 3000 + i))),
    );
    const rolls = await Promise.all(scans.map(() => lab.newRoll()));
    const responses = await Promise.all(
      scans.map((scan, i) =>
        lab.operator
          .send('post', `/api/rolls/${rolls[i]!.roll}/frames`)
          .attach('files', scan, `scan-${i}.tif`),
      ),
    );
    expect(responses.map((r) => r.status)).toEqual([201, 201, 201]);
    expect(responses.map((r) => r.body.accepted[0].fileName)).toEqual([
      'scan-0.tif',
      'scan-1.tif',
      'scan-2.tif',
    ]);
    const frames = await Promise.all(
      rolls.map(
        async ({ roll }) => (await lab.operator.get(`/api/rolls/${roll}`).expect(200)).body.frames[0],
      ),
    );
    expect(frames.map((f: { width: number; height: number }) => [f.width, f.height])).toEqual([
      [4000, 3000],
      [4000, 3001],
      [4000, 3002],
    ]);
    expect(readdirSync(join(t.config.dataDir, 'tmp'))).toEqual([]);
  });
});
