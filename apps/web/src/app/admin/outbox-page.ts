import { DatePipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, inject, signal } from '@angular/core';
import { MatButton } from '@angular/material/button';
import { MatButtonToggle, MatButtonToggleGroup } from '@angular/material/button-toggle';
import { MatIcon } from '@angular/material/icon';
import { MatProgressBar } from '@angular/material/progress-bar';
import { MatSnackBar } from '@angular/material/snack-bar';
import type { OutboxEntry, UndeliveredMailState } from '@clearbase/contracts';
import { readProblem } from '../problem/read-problem';
import { OutboxApi } from './outbox-api';

/**
 * Admin: e-mail the outbox has not delivered — given up on, or waiting to be tried again — with what went wrong,
 * and "retry now". It reads the outbox itself, so it works with the real mail server as with the local catcher.
 */
@Component({
  selector: 'cb-outbox-page',
  imports: [DatePipe, MatButton, MatButtonToggle, MatButtonToggleGroup, MatIcon, MatProgressBar],
  templateUrl: './outbox-page.html',
  styleUrl: './outbox-page.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class OutboxPage {
  private readonly api = inject(OutboxApi);
  private readonly snackBar = inject(MatSnackBar);

  protected readonly status = signal<UndeliveredMailState>('failed');
  protected readonly entries = signal<OutboxEntry[]>([]);
  protected readonly loading = signal(true);
  protected readonly problem = signal<string | null>(null);
  /** Ids of the messages a retry is on its way for. */
  protected readonly retrying = signal<ReadonlySet<number>>(new Set());

  constructor() {
    this.load();
  }

  protected show(status: UndeliveredMailState): void {
    this.status.set(status);
    this.load();
  }

  protected load(): void {
    this.loading.set(true);
    this.problem.set(null);
    this.api.list(this.status()).subscribe({
      next: (entries) => {
        this.entries.set(entries);
        this.loading.set(false);
      },
      error: (err: unknown) => {
        this.problem.set(readProblem(err).message);
        this.loading.set(false);
      },
    });
  }

  protected retry(entry: OutboxEntry): void {
    this.retrying.update((ids) => new Set([...ids, entry.id]));
    const done = () => this.retrying.update((ids) => new Set([...ids].filter((id) => id !== entry.id)));
    this.api.retry(entry.id).subscribe({
      next: (updated) => {
        done();
        // a failed message is pending again: it leaves the failed list
        this.entries.update((list) =>
          this.status() === 'failed'
            ? list.filter((e) => e.id !== updated.id)
            : list.map((e) => (e.id === updated.id ? updated : e)),
        );
        this.snackBar.open(`The e-mail to ${entry.to} will be tried again within seconds.`, undefined, {
          duration: 5000,
        });
      },
      error: (err: unknown) => {
        done();
        this.snackBar.open(readProblem(err).message, 'Close', { duration: 8000 });
        this.load();
      },
    });
  }
}
