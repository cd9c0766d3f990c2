import type { Frame, Job, RollDetail, RollEvent } from '@clearbase/contracts';

/** A roll as its page shows it: the last detail loaded with the live events applied on top. */
export interface RollView {
  detail: RollDetail;
  /** Per frame, how many times it turned done live: its thumbnail is fetched anew each time. */
  renders: Readonly<Record<number, number>>;
}

export function rollView(detail: RollDetail): RollView {
  return { detail, renders: {} };
}

const finalJobStates: readonly Job['state'][] = ['done', 'failed', 'cancelled'];

/** True once a job has ended, however it ended. */
export function jobEnded(job: Job | null): boolean {
  return job !== null && finalJobStates.includes(job.state);
}

/**
 * Applies one live event. A job event replaces the roll's job unless it is about an older job; a frame event sets
 * that frame's status, QC flags and error (a frame the page does not know yet is left for the next reload).
 *
 * @example
 * applyRollEvent(view, { type: 'frame', frameId: 7, status: 'done', qcFlags: [], error: null })
 */
export function applyRollEvent(view: RollView, event: RollEvent): RollView {
  const { detail } = view;
  if (event.type === 'job') {
    if (detail.job && event.job.id < detail.job.id) return view;
    return { ...view, detail: { ...detail, job: event.job } };
  }
  const at = detail.frames.findIndex((f) => f.id === event.frameId);
  if (at < 0) return view;
  const before = detail.frames[at]!;
  const after: Frame = { ...before, status: event.status, qcFlags: event.qcFlags, error: event.error };
  const frames = detail.frames.slice();
  frames[at] = after;
  const renders =
    event.status === 'done'
      ? { ...view.renders, [after.id]: (view.renders[after.id] ?? 0) + 1 }
      : view.renders;
  return { detail: { ...detail, frames }, renders };
}

/** Where the thumbnail of a frame comes from: the positive once rendered, the negative before. */
export function thumbnailUrl(frame: Frame, renders: number): string {
  if (frame.status === 'done') {
    // a new query each render: the server lets browsers keep a preview for an hour
    return `/api/frames/${frame.id}/preview?r=${encodeURIComponent(frame.renderedAt ?? '')}-${renders}`;
  }
  return `/api/frames/${frame.id}/negative-preview`;
}

/** The job's progress bar, 0 to 100: frames finished (done or failed) over frames to do. */
export function jobPercent(job: Job): number {
  const { done, failed, total } = job.progress;
  if (total === 0) return job.state === 'done' ? 100 : 0;
  return Math.round(((done + failed) / total) * 100);
}
