import type { FrameStatus, Job } from '@clearbase/contracts';

/**
 * The chip tone of a frame's status or a job's state: good when done, bad when failed, working while at it, plain
 * otherwise (see status-chips.scss).
 * @example statusTone('inverting') // 'working'
 */
export function statusTone(status: FrameStatus | Job['state']): string {
  if (status === 'done') return 'good';
  if (status === 'failed') return 'bad';
  if (status === 'inverting' || status === 'running') return 'working';
  return '';
}
