import type { MeasuredBase, User } from '@clearbase/contracts';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createFileStore } from '../files/file-store';
import { findFrameById, listFramesOfRoll } from '../frames/frame-repository';
import { addRollWithScans } from '../orders/order-test-fixtures';
import { findRollById } from '../rolls/roll-repository';
import { addUser, createTestApp, type TestApp } from '../test-support/test-app';
import { addTestLab } from '../test-support/test-lab';
import { findUserById, toUser } from '../users/user-repository';
import { createFilmBaseService, type FilmBaseService } from './film-base-service';

let t: TestApp;
let filmBase: FilmBaseService;
let operator: User;
let stranger: User;
let roll: number;
let frames: number[];

// the test negatives have a rebate of unexposed film along the top 4 rows (synth-command's 6 %, at least 4 px)
const rebate = { x: 8, y: 0, width: 20, height: 3 };
// a rectangle over the middle of the scene, where no film base is
const bareLight = { x: 40, y: 30, width: 1, height: 1 };

beforeAll(async () => {
  t = await createTestApp();
  const lab = await addTestLab(t);
  ({ roll, frames } = await addRollWithScans(lab.operator, {
    customerId: lab.customerId,
    stockId: lab.stockId,
    scans: [
      { name: 'a.tif', seed: 1 },
      { name: 'b.tif', seed: 2 },
    ],
  }));
  const user = async (email: string) =>
    toUser(
      (await t.db.selectFrom('users').selectAll().where('email', '=', email).executeTakeFirstOrThrow())!,
    );
  operator = await user('oskar@lab.test');
  stranger = toUser((await findUserById(t.db, await addUser(t.db, 'customer', 'other@lab.test')))!);
  filmBase = createFilmBaseService({
    db: t.db,
    store: createFileStore(t.config.dataDir),
    clock: t.clock,
    maxPixels: t.config.uploads.maxPixels,
  });
});
afterAll(() => t.close());

const auditOf = (action: string) =>
  t.db.selectFrom('audit_log').selectAll().where('action', '=', action).orderBy('id').execute();

describe('film base service', () => {
  it('chooses each uploaded frame’s own base, and the roll’s median as their fallback', async () => {
    const rollRow = (await findRollById(t.db, roll))!;
    const rows = await listFramesOfRoll(t.db, roll);
    const rollBase = filmBase.rollBase(rollRow, rows);
    expect(rollBase?.region).toBeNull();
    expect(rollBase!.confidence).toBeGreaterThan(0);
    for (const row of rows)
      expect(filmBase.choose(row, rollBase)).toMatchObject({ usable: true, source: 'frame' });
    expect(filmBase.choose({ ...rows[0]!, base_measured: null }, rollBase)).toMatchObject({
      usable: true,
      source: 'roll',
      base: { rgb: rollBase!.rgb },
      flags: ['roll-base-used'],
    });
    expect(filmBase.choose({ ...rows[0]!, base_measured: null }, null)).toMatchObject({
      usable: false,
      flags: ['no-base'],
    });
  });

  it('measures a frame with no base on file before choosing, and only then', async () => {
    const rollRow = (await findRollById(t.db, roll))!;
    const [row] = await listFramesOfRoll(t.db, roll);
    const own = JSON.parse(row!.base_measured!) as MeasuredBase;
    let asked = 0;
    const measureOwn = () => {
      asked++;
      return Promise.resolve(own);
    };
    expect(await filmBase.chooseForFrame(row!, rollRow, measureOwn)).toMatchObject({ source: 'frame' });
    expect(asked).toBe(0);
    const unmeasured = { ...row!, base_measured: null };
    expect(await filmBase.chooseForFrame(unmeasured, rollRow, measureOwn)).toMatchObject({
      source: 'frame',
      base: { rgb: own.rgb },
    });
    expect(asked).toBe(1);
    expect(await filmBase.chooseForFrame(unmeasured, rollRow, () => Promise.resolve(null))).toMatchObject({
      source: 'roll',
      flags: ['roll-base-used'],
    });
  });

  it('sets a frame’s base in a rectangle, stores it, audits before and after, and forgets the rendered source', async () => {
    await t.db.updateTable('frames').set({ base_source: 'frame' }).where('id', '=', frames[0]!).execute();
    const frame = await filmBase.setFrameBase(operator, frames[0]!, { mode: 'region', region: rebate });
    expect(frame.base).toMatchObject({ mode: 'region', region: rebate, source: null });
    expect(frame.base.measured!.confidence).toBeGreaterThan(0);
    const row = (await findFrameById(t.db, frames[0]!))!;
    expect(filmBase.choose(row, null)).toMatchObject({ usable: true, source: 'region' });
    const [audit] = await auditOf('frame-base-changed');
    expect(audit).toMatchObject({ target: `frame:${frames[0]}`, actor_id: operator.id });
    const details = JSON.parse(audit!.details!) as { before: { mode: string }; after: { mode: string } };
    expect([details.before.mode, details.after.mode]).toEqual(['auto', 'region']);

    const back = await filmBase.setFrameBase(operator, frames[0]!, { mode: 'auto' });
    expect(back.base).toMatchObject({ mode: 'auto', region: null });
    expect(back.base.measured!.confidence).toBeGreaterThan(0);
  });

  it('refuses a frame rectangle holding no film and keeps the frame as it was', async () => {
    const before = (await findFrameById(t.db, frames[1]!))!;
    await expect(
      filmBase.setFrameBase(operator, frames[1]!, { mode: 'region', region: bareLight }),
    ).rejects.toMatchObject({ code: 'no-film-in-region', status: 422 });
    expect(await findFrameById(t.db, frames[1]!)).toEqual(before);
  });

  it('answers another customer as if the frame or roll did not exist', async () => {
    await expect(filmBase.setFrameBase(stranger, frames[1]!, { mode: 'auto' })).rejects.toMatchObject({
      code: 'frame-not-found',
      status: 404,
    });
    await expect(filmBase.setRollBase(stranger, roll, { mode: 'auto' })).rejects.toMatchObject({
      code: 'roll-not-found',
      status: 404,
    });
  });

  it('sets the roll base from a leader rectangle, which frames then fall back on, and back to the median', async () => {
    const drawn = await filmBase.setRollBase(operator, roll, {
      mode: 'region',
      frameId: frames[1]!,
      region: rebate,
    });
    expect(drawn.base).toMatchObject({ mode: 'region', frameId: frames[1], region: rebate });
    const rollRow = (await findRollById(t.db, roll))!;
    expect(filmBase.rollBase(rollRow, await listFramesOfRoll(t.db, roll))).toEqual(drawn.base.measured);
    expect(await auditOf('roll-base-changed')).toHaveLength(1);

    const auto = await filmBase.setRollBase(operator, roll, { mode: 'auto' });
    expect(auto.base).toMatchObject({ mode: 'auto', frameId: null, region: null });
    const rows = await listFramesOfRoll(t.db, roll);
    expect(auto.base.measured).toEqual(filmBase.rollBase((await findRollById(t.db, roll))!, rows));
  });

  it('refuses a roll rectangle on a frame of another roll, or holding no film', async () => {
    await expect(
      filmBase.setRollBase(operator, roll, { mode: 'region', frameId: frames[1]! + 100, region: rebate }),
    ).rejects.toMatchObject({ code: 'frame-not-found', status: 404 });
    await expect(
      filmBase.setRollBase(operator, roll, { mode: 'region', frameId: frames[1]!, region: bareLight }),
    ).rejects.toMatchObject({ code: 'no-film-in-region', status: 422 });
  });

  it('keeps an automatic roll base following its frames, and leaves a drawn one alone', async () => {
    await t.db.updateTable('rolls').set({ base_measured: null }).where('id', '=', roll).execute();
    await filmBase.followFrames((await findRollById(t.db, roll))!);
    const followed = (await findRollById(t.db, roll))!;
    expect(JSON.parse(followed.base_measured!)).toEqual(
      filmBase.rollBase(followed, await listFramesOfRoll(t.db, roll)),
    );

    const drawn = await filmBase.setRollBase(operator, roll, {
      mode: 'region',
      frameId: frames[1]!,
      region: rebate,
    });
    await filmBase.followFrames((await findRollById(t.db, roll))!);
    expect(JSON.parse((await findRollById(t.db, roll))!.base_measured!)).toEqual(drawn.base.measured);
  });
});
