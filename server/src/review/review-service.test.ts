import type { User } from '@clearbase/contracts';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { AppError } from '../errors/app-error';
import { addOrderTestLab, addRollWithScans, negativeTiff } from '../orders/order-test-fixtures';
import { addUser, createTestApp, type TestApp } from '../test-support/test-app';
import { findUserByEmail, findUserById, toUser } from '../users/user-repository';
import { writeLab } from '../lab/lab-settings';
import { createReviewService, type ReviewService } from './review-service';

let t: TestApp;
let review: ReviewService;
let operator: User;
let stranger: User;
let order: number;
let firstFrames: number[];
let secondFrames: number[];

const orderStatus = async () =>
  (await t.db.selectFrom('orders').select('status').where('id', '=', order).executeTakeFirstOrThrow()).status;
const rendered = (ids: number[]) =>
  t.db.updateTable('frames').set({ status: 'done' }).where('id', 'in', ids).execute();

beforeAll(async () => {
  t = await createTestApp();
  const lab = await addOrderTestLab(t);
  operator = toUser((await findUserByEmail(t.db, 'oskar@lab.test'))!);
  stranger = toUser((await findUserById(t.db, await addUser(t.db, 'customer', 'someone@else.test')))!);
  ({ order, frames: firstFrames } = await addRollWithScans(lab.operator, {
    customerId: lab.customerId,
    stockId: lab.stockId,
    scans: [{ name: 'a.tif', seed: 1 }],
  }));
  const second = (
    await lab.operator
      .post(`/api/orders/${order}/rolls`, { stockId: lab.stockId, ei: 200, format: '135-36' })
      .expect(201)
  ).body.id as number;
  const up = await lab.operator
    .send('post', `/api/rolls/${second}/frames`)
    .attach('files', await negativeTiff({ seed: 3 }), 'c.tif')
    .expect(201);
  secondFrames = (up.body.accepted as { frameId: number }[]).map((a) => a.frameId);
  await t.db.updateTable('orders').set({ status: 'tuning' }).where('id', '=', order).execute();
  review = createReviewService({ db: t.db, clock: t.clock });
});
afterAll(() => t.close());

describe('review service', () => {
  it('hides another customer’s frame as not found and stores nothing', async () => {
    const refused = review.decide(stranger, firstFrames[0]!, { decision: 'excluded', note: '' });
    await expect(refused).rejects.toMatchObject({ status: 404 });
    await expect(refused).rejects.toBeInstanceOf(AppError);
    expect(await t.db.selectFrom('frame_reviews').selectAll().execute()).toEqual([]);
  });

  it('refuses to approve a frame not rendered yet, and leaves no audit line', async () => {
    await expect(
      review.decide(operator, firstFrames[0]!, { decision: 'approved', note: '' }),
    ).rejects.toMatchObject({
      code: 'frame-not-rendered',
      status: 409,
    });
    const audit = await t.db
      .selectFrom('audit_log')
      .select('action')
      .where('action', '=', 'frame-reviewed')
      .execute();
    expect(audit).toEqual([]);
  });

  it('approves one roll without readying the order while another roll still waits', async () => {
    await rendered([...firstFrames, ...secondFrames]);
    const result = await review.decide(operator, firstFrames[0]!, { decision: 'approved', note: '' });
    expect(result.rollApproved).toBe(true);
    expect(result.frame.id).toBe(firstFrames[0]);
    expect(result.frame.review).toMatchObject({ decision: 'approved', reviewedBy: 'Test operator' });
    expect(await orderStatus()).toBe('tuning');
  });

  it('leaves an approved order that is not paid in tuning, as marking it ready would', async () => {
    const settled = await review.decide(operator, secondFrames[0]!, { decision: 'excluded', note: 'fogged' });
    expect(settled.rollApproved).toBe(true);
    expect(await orderStatus()).toBe('tuning');
  });

  it('readies the order when the last roll is settled, audits the change, and takes it back on a rejection', async () => {
    // the lab takes payment on collection, so approval alone readies the order
    await writeLab(t, operator, { name: 'Test lab', town: '', address: '', payOnCollection: true });
    const settled = await review.decide(operator, secondFrames[0]!, { decision: 'excluded', note: 'fogged' });
    expect(settled.rollApproved).toBe(true);
    expect(await orderStatus()).toBe('ready');

    const rejected = await review.decide(operator, firstFrames[0]!, { decision: 'rejected', note: 'dust' });
    expect(rejected.rollApproved).toBe(false);
    expect(await orderStatus()).toBe('tuning');

    const changes = await t.db
      .selectFrom('audit_log')
      .select(['target', 'details'])
      .where('action', '=', 'order-status-changed')
      .where('target', '=', `order:${order}`)
      .orderBy('id')
      .execute();
    expect(changes.map((c) => JSON.parse(c.details!) as unknown).slice(-2)).toEqual([
      { before: 'tuning', after: 'ready', because: `frame:${secondFrames[0]} reviewed` },
      { before: 'ready', after: 'tuning', because: `frame:${firstFrames[0]} reviewed` },
    ]);
    const reviewed = await t.db
      .selectFrom('audit_log')
      .select('details')
      .where('action', '=', 'frame-reviewed')
      .where('target', '=', `frame:${firstFrames[0]}`)
      .orderBy('id', 'desc')
      .executeTakeFirstOrThrow();
    expect(JSON.parse(reviewed.details!)).toEqual({
      before: { decision: 'approved', note: '' },
      after: { decision: 'rejected', note: 'dust' },
    });
  });
});
