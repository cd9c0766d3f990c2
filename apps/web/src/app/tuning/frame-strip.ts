import { ChangeDetectionStrategy, Component, inject } from '@angular/core';
import type { TuningFrame } from '@clearbase/contracts';
import { TuningSession } from './tuning-session';
import { tuningSummary } from './tuning-summary';

/**
 * The frames of the roll in a strip: each one's thumbnail (the positive once rendered, the negative before), its
 * status or review, its quality flags and the tuning it carries; a click shows it, a tick picks it for a copy.
 */
@Component({
  selector: 'cb-frame-strip',
  templateUrl: './frame-strip.html',
  styleUrl: './frame-strip.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class FrameStrip {
  protected readonly session = inject(TuningSession);

  protected thumbnail(frame: TuningFrame): string {
    return frame.status === 'done'
      ? `/api/frames/${frame.id}/preview?at=${frame.renderedAt ?? ''}`
      : `/api/frames/${frame.id}/negative-preview`;
  }

  /** What the frame carries in the edits, saved or not. */
  protected carries(frame: TuningFrame): string {
    return tuningSummary(this.session.state().frames[frame.id] ?? frame.adjustments);
  }
}
