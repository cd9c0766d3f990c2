import type { User } from '@clearbase/contracts';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { addRollWithScans } from '../orders/order-test-fixtures';
import { addUser, createTestApp, type TestApp } from '../test-support/test-app';
import { addTestLab } from '../test-support/test-lab';
import { findUserById, toUser } from '../users/user-repository';
import { loadFrameFor, visibleFramesFor } from './frame-access';

let t: TestApp;
let frame: number;
const users = {} as Record<'owner' | 'other' | 'operator', User>;

beforeAll(async () => {
  t = await createTestApp();
  const lab = await addTestLab(t);
  const { frames } = await addRollWithScans(lab.operator, {
    customerId: lab.customerId,
    stockId: lab.stockId,
    scans: [{ name: 'a.tif', seed: 1 }],
  });
  frame = frames[0]!;
  const user = async (id: number) => toUser((await findUserById(t.db, id))!);
  users.owner = await user(lab.customerId);
  users.other = await user(await addUser(t.db, 'customer', 'other@lab.test'));
  users.operator = await user(await addUser(t.db, 'operator', 'second-operator@lab.test'));
});
afterAll(() => t.close());

/** Sets the operator's decision on the frame (null: nobody has decided). */
async function review(decision: 'approved' | 'excluded' | 'rejected' | null): Promise<void> {
  await t.db.deleteFrom('frame_reviews').where('frame_id', '=', frame).execute();
  if (!decision) return;
  await t.db
    .insertInto('frame_reviews')
    .values({
      frame_id: frame,
      decision,
      note: 'n',
      reviewed_by: users.operator.id,
      reviewed_at: t.clock.now().toISOString(),
    })
    .execute();
}

describe('loading a frame for a user', () => {
  it('gives staff any frame and a customer only the approved frames of their own orders', async () => {
    expect((await loadFrameFor(t.db, frame, users.operator)).id).toBe(frame);
    for (const decision of [null, 'excluded', 'rejected'] as const) {
      await review(decision);
      await expect(loadFrameFor(t.db, frame, users.owner)).rejects.toMatchObject({ status: 404 });
      expect(await visibleFramesFor(t.db, [{ id: frame }], users.owner)).toEqual([]);
    }
    await review('approved');
    expect((await loadFrameFor(t.db, frame, users.owner)).id).toBe(frame);
    expect(await visibleFramesFor(t.db, [{ id: frame }], users.owner)).toEqual([{ id: frame }]);
    await review('excluded');
    expect(await visibleFramesFor(t.db, [{ id: frame }], users.operator)).toEqual([{ id: frame }]);
  });

  it('answers another customer the same 404 as a frame that does not exist', async () => {
    const missing = frame + 1000;
    await expect(loadFrameFor(t.db, frame, users.other)).rejects.toMatchObject({
      code: 'frame-not-found',
      status: 404,
      message: `No frame with id ${frame}.`,
    });
    await expect(loadFrameFor(t.db, missing, users.operator)).rejects.toMatchObject({
      code: 'frame-not-found',
      status: 404,
      message: `No frame with id ${missing}.`,
    });
  });
});
