import { ChangeDetectionStrategy, Component, computed, inject, input, output, signal } from '@angular/core';
import { MatButton } from '@angular/material/button';
import { MatButtonToggle, MatButtonToggleGroup } from '@angular/material/button-toggle';
import { MatIcon } from '@angular/material/icon';
import { MatProgressBar } from '@angular/material/progress-bar';
import { MatSnackBar } from '@angular/material/snack-bar';
import type { InvertRollRequest, Job } from '@clearbase/contracts';
import { readProblem } from '../problem/read-problem';
import { jobStateLabel } from './roll-labels';
import { jobPercent } from './roll-view';
import { RollsApi } from './rolls-api';
import { statusTone } from './status-tone';

/**
 * A roll's inversion: the job's state and progress while it runs, with a way to cancel it; otherwise whose levels
 * the next inversion takes (or none, fixed at the metered exposure) and the buttons that start it, for the frames
 * still to do or for every frame again.
 */
@Component({
  selector: 'cb-job-view',
  imports: [MatButton, MatButtonToggleGroup, MatButtonToggle, MatIcon, MatProgressBar],
  templateUrl: './job-view.html',
  styleUrls: ['./job-view.scss', './roll-card.scss', './status-chips.scss'],
  changeDetection: ChangeDetectionStrategy.OnPush,
  host: { class: 'card' },
})
export class JobView {
  private readonly api = inject(RollsApi);
  private readonly snackBar = inject(MatSnackBar);

  readonly rollId = input.required<number>();
  /** The roll's last inversion job, if any. */
  readonly job = input.required<Job | null>();
  readonly frameCount = input.required<number>();
  /** How many of the roll's frames are rendered. */
  readonly doneCount = input.required<number>();
  /** An inversion started (or joined): the frames to render are queued again on the server. */
  readonly started = output<Job>();
  /** The job as it is after a cancel. */
  readonly cancelled = output<Job>();

  protected readonly jobStateLabel = jobStateLabel;
  protected readonly jobPercent = jobPercent;
  protected readonly statusTone = statusTone;
  protected readonly acting = signal(false);
  /** Whose levels the next inversion uses: each frame's own, the roll's together, or none (the metered exposure). */
  protected readonly levels = signal<InvertRollRequest['levels']>('frame');
  protected readonly active = computed(() => {
    const job = this.job();
    return job !== null && (job.state === 'queued' || job.state === 'running');
  });

  protected invert(frames: 'pending' | 'all'): void {
    if (this.acting()) return;
    this.acting.set(true);
    this.api.invert(this.rollId(), { frames, levels: this.levels() }).subscribe({
      next: (job) => {
        this.acting.set(false);
        this.started.emit(job);
      },
      error: (err: unknown) => {
        this.acting.set(false);
        this.snackBar.open(readProblem(err).message, 'Close', { duration: 8000 });
      },
    });
  }

  protected cancel(): void {
    const job = this.job();
    if (!job || this.acting()) return;
    this.acting.set(true);
    this.api.cancelJob(job.id).subscribe({
      next: (after) => {
        this.acting.set(false);
        this.cancelled.emit(after);
        this.snackBar.open(
          after.state === 'cancelled'
            ? 'Inversion cancelled.'
            : 'The inversion stops after the frame in hand.',
          undefined,
          { duration: 4000 },
        );
      },
      error: (err: unknown) => {
        this.acting.set(false);
        this.snackBar.open(readProblem(err).message, 'Close', { duration: 8000 });
      },
    });
  }
}
