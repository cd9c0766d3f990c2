import {
  ChangeDetectionStrategy,
  Component,
  computed,
  inject,
  input,
  signal,
  viewChild,
} from '@angular/core';
import { toObservable, toSignal } from '@angular/core/rxjs-interop';
import { MatButton } from '@angular/material/button';
import { MatIcon } from '@angular/material/icon';
import { MatProgressBar } from '@angular/material/progress-bar';
import { RouterLink } from '@angular/router';
import type { Frame, FrameStatus, Job, PixelRegion, RollEvent } from '@clearbase/contracts';
import { catchError, filter, map, merge, of, scan, share, Subject, switchMap } from 'rxjs';
import { readProblem, type ProblemMessage } from '../problem/read-problem';
import { JobView } from './job-view';
import { RollBaseForm } from './roll-base-form';
import { RollEventStream, type RollStreamMessage } from './roll-event-stream';
import { frameStatusLabel, pushPullLabel, qcFlagLabel, rollStatusLabel } from './roll-labels';
import { applyRollEvent, jobEnded, rollView, thumbnailUrl, type RollView } from './roll-view';
import { RollsApi } from './rolls-api';
import { statusTone } from './status-tone';
import { UploadQueue } from './upload-queue';

interface RollPageState {
  loading: boolean;
  view: RollView | null;
  problem: ProblemMessage | null;
}

type PageInput =
  | { kind: 'loading' }
  | { kind: 'loaded'; view: RollView }
  | { kind: 'problem'; problem: ProblemMessage }
  | { kind: 'event'; event: RollEvent };

function reducePage(state: RollPageState, input: PageInput): RollPageState {
  switch (input.kind) {
    case 'loading':
      return { ...state, loading: true };
    case 'loaded':
      // renders only grow, so a thumbnail never falls back to a copy the browser kept
      return {
        loading: false,
        problem: null,
        view: { ...input.view, renders: state.view?.renders ?? input.view.renders },
      };
    case 'problem':
      return { ...state, loading: false, problem: input.problem };
    case 'event':
      return state.view ? { ...state, view: applyRollEvent(state.view, input.event) } : state;
  }
}

const isRollEvent = (m: RollStreamMessage): m is RollEvent => m.type !== 'open';

/**
 * Lab staff: one roll — upload its scans, watch them invert live, set its base, go on to tuning. The page follows
 * the roll's live stream and composes the upload queue, the inversion job and the base form around its frames.
 */
@Component({
  selector: 'cb-roll-page',
  imports: [RouterLink, MatButton, MatIcon, MatProgressBar, UploadQueue, JobView, RollBaseForm],
  templateUrl: './roll-page.html',
  styleUrls: ['./roll-page.scss', './roll-card.scss', './status-chips.scss'],
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class RollPage {
  private readonly api = inject(RollsApi);
  private readonly stream = inject(RollEventStream);

  /** The roll id, from the route. */
  readonly id = input.required<string>();
  private readonly rollId = computed(() => Number(this.id()));

  protected readonly frameStatusLabel = frameStatusLabel;
  protected readonly rollStatusLabel = rollStatusLabel;
  protected readonly qcFlagLabel = qcFlagLabel;
  protected readonly pushPullLabel = pushPullLabel;
  protected readonly statusTone = statusTone;

  private readonly reloads = new Subject<void>();
  private readonly localEvents = new Subject<RollEvent>();

  private readonly state = toSignal(
    toObservable(this.rollId).pipe(
      switchMap((id) => {
        const live = this.stream.events(id).pipe(share());
        // reload on every (re)connection, to catch what happened while no stream was open, and when a job ends,
        // for the roll's status and the frames' outputs
        const loads = merge(
          of(null),
          this.reloads,
          live.pipe(filter((m) => m.type === 'open' || (m.type === 'job' && jobEnded(m.job)))),
        ).pipe(
          switchMap(() =>
            this.api.roll(id).pipe(
              map((detail): PageInput => ({ kind: 'loaded', view: rollView(detail) })),
              catchError((err: unknown) => of<PageInput>({ kind: 'problem', problem: readProblem(err) })),
            ),
          ),
        );
        const events = merge(live.pipe(filter(isRollEvent)), this.localEvents).pipe(
          map((event): PageInput => ({ kind: 'event', event })),
        );
        return merge(of<PageInput>({ kind: 'loading' }), loads, events).pipe(
          scan(reducePage, { loading: true, view: null, problem: null }),
        );
      }),
    ),
    { initialValue: { loading: true, view: null, problem: null } satisfies RollPageState },
  );

  protected readonly loading = computed(() => this.state().loading);
  protected readonly problem = computed(() => this.state().problem?.message ?? null);
  protected readonly notFound = computed(() => this.state().problem?.status === 404 && !this.state().view);
  protected readonly view = computed(() => this.state().view);
  protected readonly roll = computed(() => this.view()?.detail.roll ?? null);
  protected readonly frames = computed(() => this.view()?.detail.frames ?? []);
  protected readonly job = computed(() => this.view()?.detail.job ?? null);
  protected readonly counts = computed(() => {
    const c: Record<FrameStatus, number> = { queued: 0, inverting: 0, done: 0, failed: 0 };
    for (const f of this.frames()) c[f.status]++;
    return c;
  });
  protected readonly selectedId = signal<number | null>(null);
  protected readonly selected = computed(() => this.frames().find((f) => f.id === this.selectedId()) ?? null);
  private readonly baseForm = viewChild(RollBaseForm);

  protected thumbnail(frame: Frame): string {
    return thumbnailUrl(frame, this.view()?.renders[frame.id] ?? 0);
  }

  /** The rectangle the frame's base was sampled from: the roll's when the roll base is drawn on this frame. */
  protected baseRegionOf(frame: Frame): PixelRegion | null {
    const roll = this.roll();
    if (roll?.base.mode === 'region' && roll.base.frameId === frame.id && roll.base.region)
      return roll.base.region;
    return frame.base.region ?? frame.base.measured?.region ?? null;
  }

  protected baseSourceLabel(frame: Frame): string {
    switch (frame.base.source) {
      case 'frame':
        return 'base found in the frame';
      case 'region':
        return 'base from the rectangle drawn';
      case 'roll':
        return 'the roll base was used';
      default:
        return frame.base.measured ? 'base found on upload' : 'no base found yet';
    }
  }

  /** Starts a roll base on this frame, from the rectangle its own base came from when there is one. */
  protected useForRollBase(frame: Frame): void {
    this.baseForm()?.startFrom(frame.id, this.baseRegionOf(frame));
  }

  /** Reads the roll again. */
  protected reload(): void {
    this.reloads.next();
  }

  /** Shows the job as the server answered, then reads the roll again when it says the frames were queued. */
  protected jobChanged(job: Job, queued: boolean): void {
    this.localEvents.next({ type: 'job', job });
    if (queued) this.reloads.next();
  }
}
