import { HttpTestingController } from '@angular/common/http/testing';
import { TestBed } from '@angular/core/testing';
import type { RollTuning } from '@clearbase/contracts';
import { afterEach, describe, expect, it } from 'vitest';
import { PreviewRenderer } from '../preview/preview-renderer';
import {
  answerSave,
  configureTuningTest,
  flushNegative,
  green,
  pollMs,
  settle,
  tuningFrame as frame,
  tuningSheet as sheet,
  zero,
  type InstantPort,
} from './tuning-testing';
import { TuningSession } from './tuning-session';

let backend: HttpTestingController;
let ports: InstantPort[];

/** A session of its own on roll 7, with the sheet and the first frame's negative answered. */
async function open(tuning: RollTuning): Promise<TuningSession> {
  ports = [];
  configureTuningTest(ports, [PreviewRenderer, TuningSession]);
  backend = TestBed.inject(HttpTestingController);
  const session = TestBed.inject(TuningSession);
  session.open(7);
  backend.expectOne('/api/rolls/7/tuning').flush(tuning);
  await settle();
  flushNegative(backend.expectOne(`/api/frames/${tuning.frames[0]!.id}/working-negative`));
  await settle();
  return session;
}

const t = {
  settle: () => settle(),
  get backend() {
    return backend;
  },
};

describe('TuningSession', () => {
  afterEach(() => backend.verify());

  it('starts from the saved tuning on the first frame, and previews it before and after', async () => {
    const session = await open(sheet([frame(1, { adjustments: green(3) }), frame(2)], green(-2)));
    expect(session.frame()?.index).toBe(1);
    expect(session.editing()).toEqual(green(3));
    expect(session.state().roll).toEqual(green(-2));
    expect(session.unsaved()).toBe(false);
    expect(ports[0]!.renders().map((r) => r.side)).toEqual(['before', 'after']);
  });

  it('saves the changed frame and the roll, then renders what is pending', async () => {
    const session = await open(sheet([frame(1), frame(2)]));
    session.changeCast('magentaGreen', 5);
    session.changeExposure(2);
    session.target.set('roll');
    session.changeCast('yellowBlue', -3);
    session.save();

    const frameSave = backend.expectOne({ method: 'PUT', url: '/api/frames/11/adjustments' });
    expect(frameSave.request.body).toEqual({ ...green(5), exposureStops: 2 / 6 });
    const rollSave = backend.expectOne({ method: 'PUT', url: '/api/rolls/7/adjustments' });
    expect(rollSave.request.body).toEqual({ ...zero, balance: { ...zero.balance, yellowBlue: -3 } });
    frameSave.flush({});
    rollSave.flush({});
    await settle();
    const invert = backend.expectOne({ method: 'POST', url: '/api/rolls/7/invert' });
    expect(invert.request.body).toEqual({ frames: 'pending', levels: 'frame' });
    invert.flush({});
    await settle();
    backend.expectOne('/api/rolls/7/tuning').flush(sheet([frame(1), frame(2)]));
    await settle();
    expect(session.unsaved()).toBe(false);
  });

  it('renders with the roll’s levels together when asked', async () => {
    const session = await open(sheet([frame(1)]));
    session.rollLevels.set(true);
    session.save();
    expect(backend.match((r) => r.method === 'PUT')).toEqual([]);
    const invert = backend.expectOne('/api/rolls/7/invert');
    expect(invert.request.body).toEqual({ frames: 'pending', levels: 'roll' });
    invert.flush({});
    await settle();
    backend.expectOne('/api/rolls/7/tuning').flush(sheet([frame(1)]));
    await settle();
  });

  it('copies the frame’s tuning to the selected frames in one step, and saves one request per selected frame', async () => {
    const session = await open(sheet([frame(1, { adjustments: green(5) }), frame(2), frame(3), frame(4)]));
    session.toggleSelected(12);
    session.toggleSelected(13);
    session.toggleSelected(14);
    session.toggleSelected(13);
    session.copyToSelected();
    expect(session.state().frames[12]).toEqual(green(5));
    expect(session.state().frames[13]).toEqual(zero);
    expect(session.state().frames[14]).toEqual(green(5));
    session.undo();
    expect(session.state().frames[14]).toEqual(zero);
    session.redo();
    session.save();
    const saves = backend.match((r) => r.method === 'PUT');
    expect(saves.map((r) => r.request.url).sort()).toEqual([
      '/api/frames/12/adjustments',
      '/api/frames/14/adjustments',
    ]);
    for (const r of saves) expect(r.request.body).toEqual(green(5));
    for (const r of saves) r.flush({});
    await answerSave(t, sheet([frame(1, { adjustments: green(5) })]));
  });

  it('takes each change as one step of the history, a reset too, and a new change drops what was undone', async () => {
    const session = await open(sheet([frame(1)]));
    expect(session.canUndo()).toBe(false);
    session.changeCast('cyanRed', 4);
    session.changeCast('cyanRed', 7);
    session.undo();
    expect(session.editing().balance.cyanRed).toBe(4);
    session.undo();
    expect(session.editing().balance.cyanRed).toBe(0);
    expect(session.canRedo()).toBe(true);
    session.redo();
    session.reset();
    expect(session.editing()).toEqual(zero);
    session.undo();
    expect(session.editing().balance.cyanRed).toBe(4);
    session.changeContrast(1.234);
    expect(session.editing().contrast).toBe(1.23);
    expect(session.canRedo()).toBe(false);
  });

  it('steps between frames, stopping at the ends', async () => {
    const session = await open(sheet([frame(1), frame(2)]));
    session.step(-1);
    backend.expectNone('/api/frames/11/working-negative');
    session.step(1);
    flushNegative(backend.expectOne('/api/frames/12/working-negative'));
    await settle();
    expect(session.frame()?.index).toBe(2);
    expect(session.negative()).not.toBeNull();
    session.step(1);
    backend.expectNone('/api/frames/12/working-negative');
  });

  it('keeps every change after a failed save, with the server’s sentence, and sends it all again', async () => {
    const session = await open(sheet([frame(1)]));
    session.changeCast('magentaGreen', 8);
    session.save();
    expect(session.saving()).toBe(true);
    backend
      .expectOne('/api/frames/11/adjustments')
      .flush(
        { type: 'about:blank', title: 'Conflict', status: 409, detail: 'Tuning is closed.' },
        { status: 409, statusText: 'Conflict', headers: { 'content-type': 'application/problem+json' } },
      );
    await settle();
    expect(session.saving()).toBe(false);
    expect(session.saveProblem()).toBe('Tuning is closed.');
    expect(session.unsaved()).toBe(true);
    session.save();
    expect(session.saveProblem()).toBeNull();
    expect(backend.expectOne('/api/frames/11/adjustments').request.body).toEqual(green(8));
    backend.expectNone('/api/rolls/7/invert');
  });

  it('keeps what is edited during a slow save unsaved, and reads the sheet until the frames are rendered', async () => {
    const session = await open(sheet([frame(1)]));
    session.changeCast('cyanRed', 2);
    session.save();
    const slow = backend.expectOne('/api/frames/11/adjustments');
    session.changeCast('cyanRed', 3);
    slow.flush({});
    await settle();
    backend.expectOne('/api/rolls/7/invert').flush({});
    await settle();
    // saved at 2, edited to 3 meanwhile: still something to save
    expect(session.unsaved()).toBe(true);
    expect(session.editing().balance.cyanRed).toBe(3);
    backend.expectOne('/api/rolls/7/tuning').flush(sheet([frame(1, { status: 'queued', outputs: [] })]));
    await settle();
    expect(session.frame()?.status).toBe('queued');
    await new Promise((resolve) => setTimeout(resolve, pollMs * 2));
    backend
      .expectOne('/api/rolls/7/tuning')
      .flush(sheet([frame(1, { renderedAt: '2026-11-20T11:00:00.000Z' })]));
    await settle();
    expect(session.frame()?.status).toBe('done');
    await new Promise((resolve) => setTimeout(resolve, pollMs * 3));
    backend.expectNone('/api/rolls/7/tuning');
  });

  it('records a review with the note, and takes the frame and the roll’s approval from the answer', async () => {
    const session = await open(sheet([frame(1)]));
    session.note.set('  grey card reads neutral ');
    session.review('approved');
    const req = backend.expectOne({ method: 'POST', url: '/api/frames/11/review' });
    expect(req.request.body).toEqual({ decision: 'approved', note: 'grey card reads neutral' });
    const review = {
      decision: 'approved' as const,
      note: 'grey card reads neutral',
      reviewedBy: 'Operator',
      reviewedAt: '2026-11-20T12:00:00.000Z',
    };
    req.flush({ frame: frame(1, { review }), rollApproved: true });
    await settle();
    expect(session.frame()?.review).toEqual(review);
    expect(session.sheet()?.approved).toBe(true);
    expect(session.note()).toBe('');
  });
});
