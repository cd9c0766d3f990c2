import type { FrameStatus, JobState, QcFlag, RollStatus } from '@clearbase/contracts';

const frameStatusLabels: Record<FrameStatus, string> = {
  queued: 'Queued',
  inverting: 'Inverting',
  done: 'Done',
  failed: 'Failed',
};

const rollStatusLabels: Record<RollStatus, string> = {
  'awaiting-scans': 'Awaiting scans',
  scanned: 'Scanned',
  inverting: 'Inverting',
  inverted: 'Inverted',
  'needs-attention': 'Needs attention',
};

const jobStateLabels: Record<JobState, string> = {
  queued: 'Waiting for the queue',
  running: 'Inverting',
  done: 'Finished',
  failed: 'Failed',
  cancelled: 'Cancelled',
};

/** What each QC flag asks the operator to check. */
const qcFlagLabels: Record<QcFlag, string> = {
  'roll-base-used': 'Roll base used',
  'no-base': 'No film base',
  'clipped-highlights': 'Clipped highlights',
  'thin-negative': 'Thin negative',
  'dense-negative': 'Dense negative',
};

export const frameStatusLabel = (s: FrameStatus) => frameStatusLabels[s];
export const rollStatusLabel = (s: RollStatus) => rollStatusLabels[s];
export const jobStateLabel = (s: JobState) => jobStateLabels[s];
export const qcFlagLabel = (f: QcFlag) => qcFlagLabels[f];

/** Push and pull as the trade says it: "+1 stop push", "−½ stop pull", "Normal". */
export function pushPullLabel(stops: number): string {
  if (stops === 0) return 'Normal';
  const size = Math.abs(stops);
  const whole = Math.trunc(size);
  const text = size % 1 === 0 ? String(whole) : whole === 0 ? '½' : `${whole}½`;
  const unit = size > 1 ? 'stops' : 'stop';
  return stops > 0 ? `+${text} ${unit} push` : `−${text} ${unit} pull`;
}

/** Bytes for people: "820 B", "12.4 kB", "96.0 MB". */
export function bytesLabel(bytes: number): string {
  if (bytes < 1000) return `${bytes} B`;
  if (bytes < 1e6) return `${(bytes / 1e3).toFixed(1)} kB`;
  if (bytes < 1e9) return `${(bytes / 1e6).toFixed(1)} MB`;
  return `${(bytes / 1e9).toFixed(2)} GB`;
}
