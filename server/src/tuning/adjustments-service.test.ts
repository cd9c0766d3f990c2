import { neutralAdjustments, type Adjustments, type User } from '@clearbase/contracts';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { listFramesOfRoll } from '../frames/frame-repository';
import { addRollWithScans } from '../orders/order-test-fixtures';
import { addUser, createTestApp, type TestApp } from '../test-support/test-app';
import { addTestLab } from '../test-support/test-lab';
import { findUserById, toUser } from '../users/user-repository';
import { createAdjustmentsService, type AdjustmentsService } from './adjustments-service';

let t: TestApp;
let adjustments: AdjustmentsService;
let operator: User;
let stranger: User;
let roll: number;
let frames: number[];

const warmer: Adjustments = {
  ...neutralAdjustments,
  balance: { cyanRed: 4, magentaGreen: 0, yellowBlue: -2 },
};

beforeAll(async () => {
  t = await createTestApp();
  const lab = await addTestLab(t);
  ({ roll, frames } = await addRollWithScans(lab.operator, {
    customerId: lab.customerId,
    stockId: lab.stockId,
    scans: [
      { name: 'a.tif', seed: 1 },
      { name: 'b.tif', seed: 2 },
      { name: 'c.tif', seed: 3 },
    ],
  }));
  const user = async (id: number) => toUser((await findUserById(t.db, id))!);
  operator = await user(await addUser(t.db, 'operator', 'second-operator@lab.test'));
  stranger = await user(await addUser(t.db, 'customer', 'other@lab.test'));
  adjustments = createAdjustmentsService({ db: t.db, clock: t.clock });
});
afterAll(() => t.close());

const auditOf = async (action: string) =>
  (await t.db.selectFrom('audit_log').selectAll().where('action', '=', action).orderBy('id').execute()).map(
    (a) => ({ target: a.target, details: JSON.parse(a.details!) as unknown }),
  );

describe('adjustments service', () => {
  it('tunes a roll: stores it, queues its frames again but the one being inverted, and audits before and after', async () => {
    await t.db
      .updateTable('frames')
      .set({ status: 'done', attempts: 1 })
      .where('roll_id', '=', roll)
      .execute();
    await t.db.updateTable('frames').set({ status: 'inverting' }).where('id', '=', frames[2]!).execute();

    const tuned = await adjustments.adjustRoll(operator, roll, warmer);

    expect(tuned.adjustments).toEqual(warmer);
    expect((await listFramesOfRoll(t.db, roll)).map((f) => [f.status, f.attempts])).toEqual([
      ['queued', 0],
      ['queued', 0],
      ['inverting', 1],
    ]);
    expect(await auditOf('roll-adjusted')).toEqual([
      { target: `roll:${roll}`, details: { before: neutralAdjustments, after: warmer } },
    ]);
  });

  it('tunes one frame on top of its roll and queues it again; a frame being inverted keeps its state', async () => {
    await t.db
      .updateTable('frames')
      .set({ status: 'done', error: 'old' })
      .where('id', '=', frames[0]!)
      .execute();
    const lighter = { ...neutralAdjustments, exposureStops: 1 / 3 };

    const frame = await adjustments.adjustFrame(operator, frames[0]!, lighter);
    const inverting = await adjustments.adjustFrame(operator, frames[2]!, lighter);

    expect(frame).toMatchObject({
      id: frames[0],
      status: 'queued',
      attempts: 0,
      error: null,
      adjustments: lighter,
    });
    expect(inverting).toMatchObject({ status: 'inverting', adjustments: lighter });
    expect((await auditOf('frame-adjusted')).map((a) => a.target)).toEqual([
      `frame:${frames[0]}`,
      `frame:${frames[2]}`,
    ]);
  });

  it('answers another customer as if the roll or frame did not exist, and changes nothing', async () => {
    await expect(adjustments.adjustRoll(stranger, roll, neutralAdjustments)).rejects.toMatchObject({
      code: 'roll-not-found',
      status: 404,
    });
    await expect(adjustments.adjustFrame(stranger, frames[1]!, neutralAdjustments)).rejects.toMatchObject({
      code: 'frame-not-found',
      status: 404,
    });
    expect(await auditOf('roll-adjusted')).toHaveLength(1);
  });
});
