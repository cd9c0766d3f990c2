import { ChangeDetectionStrategy, Component, computed, inject, input, signal } from '@angular/core';
import { toObservable, toSignal } from '@angular/core/rxjs-interop';
import { MatButton, MatIconButton } from '@angular/material/button';
import { MatIcon } from '@angular/material/icon';
import { MatProgressBar } from '@angular/material/progress-bar';
import { RouterLink } from '@angular/router';
import type { GalleryFrame, GalleryResponse } from '@clearbase/contracts';
import { catchError, map, of, startWith, switchMap } from 'rxjs';
import { outputFormatLabel } from '../orders/order-labels';
import { BrowserLocation } from '../prices/browser-location';
import { showMoney } from '../prices/money';
import { readProblem, type ProblemMessage } from '../problem/read-problem';
import { GalleryApi } from './gallery-api';

interface GalleryView {
  loading: boolean;
  gallery: GalleryResponse | null;
  problem: ProblemMessage | null;
}

/**
 * An order's finished scans: thumbnails by roll, a full-screen view stepped with the arrow keys and closed with
 * Escape, each frame's files to download, and the whole order as one zip. Until the order is ready and paid the
 * customer sees the thumbnails of approved frames only, with why the rest is held back and what is left to pay.
 */
@Component({
  selector: 'cb-gallery-page',
  imports: [RouterLink, MatButton, MatIconButton, MatIcon, MatProgressBar],
  templateUrl: './gallery-page.html',
  styleUrl: './gallery-page.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
  host: { '(document:keydown)': 'onKey($event)' },
})
export class GalleryPage {
  private readonly api = inject(GalleryApi);
  private readonly location = inject(BrowserLocation);

  /** The order id, from the route. */
  readonly id = input.required<string>();

  protected readonly formatLabel = outputFormatLabel;

  private readonly state = toSignal(
    toObservable(this.id).pipe(
      switchMap((id) =>
        this.api.gallery(Number(id)).pipe(
          map((gallery): GalleryView => ({ loading: false, gallery, problem: null })),
          catchError((err: unknown) =>
            of<GalleryView>({ loading: false, gallery: null, problem: readProblem(err) }),
          ),
          startWith<GalleryView>({ loading: true, gallery: null, problem: null }),
        ),
      ),
    ),
    { initialValue: { loading: true, gallery: null, problem: null } as GalleryView },
  );
  protected readonly loading = computed(() => this.state().loading);
  protected readonly problem = computed(() => this.state().problem);
  protected readonly frames = computed(() => this.state().gallery?.frames ?? []);
  /** Why the full-size scans are not to be had yet, or null once they are (or before the gallery loads). */
  protected readonly heldBack = computed(() => {
    const gallery = this.state().gallery;
    return gallery && !gallery.release.fullSize ? gallery.release.reason : null;
  });
  protected readonly released = computed(() => this.state().gallery?.release.fullSize ?? false);
  /** What is left to pay, shown while the scans are held back for it. */
  protected readonly due = computed(() => {
    const balance = this.state().gallery?.balance;
    return balance?.dueMinor ? showMoney(balance.dueMinor, balance.currency) : null;
  });
  /** Frames grouped by roll, in order. */
  protected readonly rolls = computed(() => {
    const groups: { rollNumber: number; frames: GalleryFrame[] }[] = [];
    for (const frame of this.frames()) {
      const last = groups.at(-1);
      if (last?.rollNumber === frame.rollNumber) last.frames.push(frame);
      else groups.push({ rollNumber: frame.rollNumber, frames: [frame] });
    }
    return groups;
  });

  /** Index in `frames()` of the frame shown full screen, or null. */
  protected readonly open = signal<number | null>(null);
  protected readonly current = computed(() => {
    const i = this.open();
    return i === null ? null : (this.frames()[i] ?? null);
  });
  protected readonly zipping = signal(false);
  protected readonly zipProblem = signal<string | null>(null);

  protected show(frame: GalleryFrame): void {
    this.open.set(this.frames().indexOf(frame));
  }

  protected close(): void {
    this.open.set(null);
  }

  protected step(by: number): void {
    const i = this.open();
    const count = this.frames().length;
    if (i === null || count === 0) return;
    this.open.set((i + by + count) % count);
  }

  protected onKey(event: KeyboardEvent): void {
    if (this.open() === null) return;
    if (event.key === 'ArrowRight') this.step(1);
    else if (event.key === 'ArrowLeft') this.step(-1);
    else if (event.key === 'Escape') this.close();
    else return;
    event.preventDefault();
  }

  protected downloadAll(): void {
    if (this.zipping()) return;
    this.zipping.set(true);
    this.zipProblem.set(null);
    this.api.downloadLink(Number(this.id())).subscribe({
      next: (link) => {
        this.zipping.set(false);
        this.location.assign(link.url);
      },
      error: (err: unknown) => {
        this.zipping.set(false);
        this.zipProblem.set(readProblem(err).message);
      },
    });
  }
}
