import type { Adjustments, Frame, FrameStatus, Job, RollDetail } from '@clearbase/contracts';

// written out: the browser code takes only types from the contracts
const neutralAdjustmentsForTests: Adjustments = {
  balance: { cyanRed: 0, magentaGreen: 0, yellowBlue: 0 },
  exposureStops: 0,
  contrast: null,
  blackPointStops: 0,
  whitePointStops: 0,
};

/** An invented frame of roll 7: id 100 + index. */
export function testFrame(index: number, status: FrameStatus): Frame {
  return {
    id: 100 + index,
    rollId: 7,
    index,
    fileName: `harbour-${index}.tif`,
    width: 480,
    height: 320,
    bitDepth: 16,
    status,
    qcFlags: [],
    base: { mode: 'auto', region: null, source: null, measured: null },
    adjustments: neutralAdjustmentsForTests,
    attempts: 0,
    error: null,
    warnings: [],
    outputs: [],
    renderedAt: null,
    createdAt: '2026-11-20T10:00:00.000Z',
  };
}

/** An invented inversion job of roll 7 with two frames to do. */
export function testJob(id: number, state: Job['state']): Job {
  return {
    id,
    kind: 'invert-roll',
    target: 'roll:7',
    state,
    attempts: 0,
    progress: { done: 0, failed: 0, total: 2 },
    error: null,
    createdAt: '2026-11-20T10:05:00.000Z',
    startedAt: null,
    finishedAt: null,
  };
}

/** Roll 7 of order 3, of an invented stock, with the frames and job given. */
export function testRollDetail(frames: Frame[], job: Job | null = null): RollDetail {
  return {
    roll: {
      id: 7,
      orderId: 3,
      stockId: 1,
      stockName: 'Glasswing 400',
      ei: 800,
      pushPull: 1,
      format: '135-36',
      scannerId: null,
      profileVersionId: 9,
      profileVersion: 2,
      status: frames.length ? 'scanned' : 'awaiting-scans',
      base: { mode: 'auto', frameId: null, region: null, measured: null },
      adjustments: neutralAdjustmentsForTests,
      frameCount: frames.length,
      createdAt: '2026-11-20T09:00:00.000Z',
      updatedAt: '2026-11-20T09:00:00.000Z',
    },
    frames,
    job,
  };
}
