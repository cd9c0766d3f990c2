import type { Frame, Job, RollDetail, RollEvent } from '@clearbase/contracts';
import { applyRollEvent, jobEnded, jobPercent, rollView, thumbnailUrl } from './roll-view';
import { testFrame, testJob, testRollDetail } from './roll-testing';

const detail: RollDetail = testRollDetail(
  [testFrame(1, 'queued'), testFrame(2, 'queued')],
  testJob(4, 'running'),
);

describe('applyRollEvent', () => {
  it('sets the status, flags and error of the frame the event names', () => {
    const view = applyRollEvent(rollView(detail), {
      type: 'frame',
      frameId: 102,
      status: 'done',
      qcFlags: ['thin-negative'],
      error: null,
    });
    expect(view.detail.frames.map((f) => [f.id, f.status, f.qcFlags])).toEqual([
      [101, 'queued', []],
      [102, 'done', ['thin-negative']],
    ]);
  });

  it('counts each live render so the thumbnail is fetched again', () => {
    let view = rollView(detail);
    const done: RollEvent & { type: 'frame' } = {
      type: 'frame',
      frameId: 101,
      status: 'done',
      qcFlags: [],
      error: null,
    };
    view = applyRollEvent(view, done);
    view = applyRollEvent(view, { ...done, status: 'inverting' });
    view = applyRollEvent(view, done);
    expect(view.renders).toEqual({ 101: 2 });
    const frame = view.detail.frames[0]!;
    expect(thumbnailUrl(frame, view.renders[101]!)).toBe('/api/frames/101/preview?r=-2');
  });

  it('keeps the failure of a frame', () => {
    const view = applyRollEvent(rollView(detail), {
      type: 'frame',
      frameId: 101,
      status: 'failed',
      qcFlags: ['no-base'],
      error: 'No film base found.',
    });
    expect(view.detail.frames[0]).toMatchObject({ status: 'failed', error: 'No film base found.' });
  });

  it('leaves a frame it does not know for the next reload', () => {
    const before = rollView(detail);
    const after = applyRollEvent(before, {
      type: 'frame',
      frameId: 999,
      status: 'done',
      qcFlags: [],
      error: null,
    });
    expect(after).toBe(before);
  });

  it('takes the progress of the roll’s job and of a newer one, never of an older one', () => {
    const moved: Job = { ...testJob(4, 'running'), progress: { done: 1, failed: 0, total: 2 } };
    let view = applyRollEvent(rollView(detail), { type: 'job', job: moved });
    expect(jobPercent(view.detail.job!)).toBe(50);
    view = applyRollEvent(view, { type: 'job', job: testJob(3, 'done') });
    expect(view.detail.job!.id).toBe(4);
    view = applyRollEvent(view, { type: 'job', job: testJob(5, 'queued') });
    expect(view.detail.job!.id).toBe(5);
  });
});

describe('thumbnailUrl', () => {
  it('shows the negative until the frame is done', () => {
    const frame: Frame = testFrame(1, 'inverting');
    expect(thumbnailUrl(frame, 0)).toBe('/api/frames/101/negative-preview');
  });
});

describe('jobEnded and jobPercent', () => {
  it('counts failed frames as finished and knows the final states', () => {
    const job: Job = { ...testJob(1, 'failed'), progress: { done: 2, failed: 2, total: 4 } };
    expect(jobPercent(job)).toBe(100);
    expect(jobEnded(job)).toBe(true);
    expect(jobEnded(testJob(1, 'running'))).toBe(false);
    expect(jobEnded(null)).toBe(false);
  });
});
