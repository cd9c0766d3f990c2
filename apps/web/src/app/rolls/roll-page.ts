import { DecimalPipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, computed, effect, inject, input, signal } from '@angular/core';
import { takeUntilDestroyed, toObservable, toSignal } from '@angular/core/rxjs-interop';
import { NonNullableFormBuilder, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButton } from '@angular/material/button';
import { MatButtonToggle, MatButtonToggleGroup } from '@angular/material/button-toggle';
import { MatError, MatFormField, MatLabel } from '@angular/material/form-field';
import { MatIcon } from '@angular/material/icon';
import { MatInput } from '@angular/material/input';
import { MatProgressBar } from '@angular/material/progress-bar';
import { MatOption, MatSelect } from '@angular/material/select';
import { MatSnackBar } from '@angular/material/snack-bar';
import { RouterLink } from '@angular/router';
import type {
  Frame,
  FrameStatus,
  InvertRollRequest,
  Job,
  PixelRegion,
  RollBaseRequest,
  RollEvent,
} from '@clearbase/contracts';
import {
  catchError,
  concatMap,
  filter,
  from,
  map,
  merge,
  mergeMap,
  of,
  scan,
  share,
  Subject,
  switchMap,
} from 'rxjs';
import { applyFieldProblems } from '../forms/apply-field-problems';
import { readProblem, type ProblemMessage } from '../problem/read-problem';
import { RollEventStream, type RollStreamMessage } from './roll-event-stream';
import {
  bytesLabel,
  frameStatusLabel,
  jobStateLabel,
  pushPullLabel,
  qcFlagLabel,
  rollStatusLabel,
} from './roll-labels';
import { applyRollEvent, jobEnded, jobPercent, rollView, thumbnailUrl, type RollView } from './roll-view';
import { RollsApi, type KeyedFile } from './rolls-api';
import { emptyUploads, itemPercent, reduceUploads, uploadBatch, type UploadAction } from './upload-state';

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

/** The scan types the server takes: TIFF and PNG, 8 or 16 bits. */
const acceptedTypes = '.tif,.tiff,.png,image/tiff,image/png';

/**
 * Lab staff: one roll — upload its scans, watch them invert live, set its base, go on to tuning. Scans go up one
 * file a request, in the order picked: every file has its own honest byte bar, and frames are numbered in that order.
 */
@Component({
  selector: 'cb-roll-page',
  imports: [
    DecimalPipe,
    ReactiveFormsModule,
    RouterLink,
    MatButton,
    MatButtonToggleGroup,
    MatButtonToggle,
    MatFormField,
    MatLabel,
    MatError,
    MatInput,
    MatSelect,
    MatOption,
    MatIcon,
    MatProgressBar,
  ],
  templateUrl: './roll-page.html',
  styleUrls: ['./roll-page.scss', './status-chips.scss'],
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class RollPage {
  private readonly api = inject(RollsApi);
  private readonly stream = inject(RollEventStream);
  private readonly snackBar = inject(MatSnackBar);
  private readonly fb = inject(NonNullableFormBuilder);

  /** The roll id, from the route. */
  readonly id = input.required<string>();
  private readonly rollId = computed(() => Number(this.id()));

  protected readonly acceptedTypes = acceptedTypes;
  protected readonly frameStatusLabel = frameStatusLabel;
  protected readonly rollStatusLabel = rollStatusLabel;
  protected readonly jobStateLabel = jobStateLabel;
  protected readonly qcFlagLabel = qcFlagLabel;
  protected readonly pushPullLabel = pushPullLabel;
  protected readonly bytesLabel = bytesLabel;
  protected readonly itemPercent = itemPercent;
  protected readonly jobPercent = jobPercent;

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
  protected readonly jobActive = computed(() => {
    const job = this.job();
    return job !== null && (job.state === 'queued' || job.state === 'running');
  });
  protected readonly counts = computed(() => {
    const c: Record<FrameStatus, number> = { queued: 0, inverting: 0, done: 0, failed: 0 };
    for (const f of this.frames()) c[f.status]++;
    return c;
  });
  protected readonly selectedId = signal<number | null>(null);
  protected readonly selected = computed(() => this.frames().find((f) => f.id === this.selectedId()) ?? null);
  protected readonly acting = signal(false);
  /** Whose levels the next inversion uses: each frame's own, or the roll's together. */
  protected readonly levels = signal<InvertRollRequest['levels']>('frame');

  // uploads: every picked file keeps its line for as long as the page is open
  private readonly uploadActions = new Subject<UploadAction>();
  protected readonly uploads = toSignal(this.uploadActions.pipe(scan(reduceUploads, emptyUploads)), {
    initialValue: emptyUploads,
  });
  protected readonly batch = computed(() => uploadBatch(this.uploads()));
  private readonly picked = new Subject<KeyedFile[]>();
  private nextKey = 1;
  protected readonly dragging = signal(false);

  protected readonly baseForm = this.fb.group({
    mode: this.fb.control<RollBaseRequest['mode']>('auto'),
    frameId: this.fb.control<number | null>(null, Validators.required),
    x: this.fb.control<number | null>(0, [Validators.required, Validators.min(0)]),
    y: this.fb.control<number | null>(0, [Validators.required, Validators.min(0)]),
    width: this.fb.control<number | null>(null, [Validators.required, Validators.min(1)]),
    height: this.fb.control<number | null>(null, [Validators.required, Validators.min(1)]),
  });
  protected readonly baseMode = toSignal(this.baseForm.controls.mode.valueChanges, {
    initialValue: 'auto' as const,
  });
  protected readonly baseProblem = signal<string | null>(null);
  protected readonly savingBase = signal(false);

  constructor() {
    this.picked
      .pipe(
        mergeMap((files) => from(files)),
        concatMap((file) => this.api.upload(this.rollId(), [file])),
        takeUntilDestroyed(),
      )
      .subscribe((action) => {
        this.uploadActions.next(action);
        if (action.type === 'answered' && action.result.accepted.length > 0) this.reloads.next();
      });
    // the form starts from the roll's base as stored, once per roll
    let formFor: number | null = null;
    effect(() => {
      const roll = this.roll();
      if (!roll || formFor === roll.id) return;
      formFor = roll.id;
      const region = roll.base.region;
      this.baseForm.reset({
        mode: roll.base.mode,
        frameId: roll.base.frameId,
        x: region?.x ?? 0,
        y: region?.y ?? 0,
        width: region?.width ?? null,
        height: region?.height ?? null,
      });
    });
  }

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
    const r = this.baseRegionOf(frame);
    this.baseForm.patchValue({
      mode: 'region',
      frameId: frame.id,
      ...(r ? { x: r.x, y: r.y, width: r.width, height: r.height } : {}),
    });
  }

  protected statusTone(status: FrameStatus | Job['state']): string {
    if (status === 'done') return 'good';
    if (status === 'failed') return 'bad';
    if (status === 'inverting' || status === 'running') return 'working';
    return '';
  }

  protected onPicked(input: HTMLInputElement): void {
    if (input.files?.length) this.addFiles([...input.files]);
    // the same file may be picked again after a fix
    input.value = '';
  }

  protected onDragOver(event: DragEvent): void {
    if (!event.dataTransfer?.types.includes('Files')) return;
    event.preventDefault();
    event.dataTransfer.dropEffect = 'copy';
    this.dragging.set(true);
  }

  protected onDrop(event: DragEvent): void {
    event.preventDefault();
    this.dragging.set(false);
    const files = event.dataTransfer?.files;
    if (files?.length) this.addFiles([...files]);
  }

  /** Puts files on the upload list and in the queue that sends them. */
  addFiles(files: readonly File[]): void {
    const keyed = files.map((file): KeyedFile => ({ key: this.nextKey++, file }));
    this.uploadActions.next({
      type: 'picked',
      files: keyed.map(({ key, file }) => ({ key, fileName: file.name, size: file.size })),
    });
    this.picked.next(keyed);
  }

  protected invert(frames: 'pending' | 'all'): void {
    const roll = this.roll();
    if (!roll || this.acting()) return;
    this.acting.set(true);
    this.api.invert(roll.id, { frames, levels: this.levels() }).subscribe({
      next: (job) => {
        this.acting.set(false);
        this.localEvents.next({ type: 'job', job });
        // the frames to render are queued again on the server; their rows tell it
        this.reloads.next();
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
        this.localEvents.next({ type: 'job', job: after });
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

  protected saveBase(): void {
    const roll = this.roll();
    if (!roll || this.savingBase()) return;
    const v = this.baseForm.getRawValue();
    let request: RollBaseRequest;
    if (v.mode === 'auto') {
      request = { mode: 'auto' };
    } else {
      this.baseForm.markAllAsTouched();
      if (this.baseForm.invalid) return;
      request = {
        mode: 'region',
        frameId: Number(v.frameId),
        region: { x: Number(v.x), y: Number(v.y), width: Number(v.width), height: Number(v.height) },
      };
    }
    this.savingBase.set(true);
    this.baseProblem.set(null);
    this.api.setBase(roll.id, request).subscribe({
      next: () => {
        this.savingBase.set(false);
        this.reloads.next();
        this.snackBar.open('Roll base saved.', undefined, { duration: 4000 });
      },
      error: (err: unknown) => {
        this.savingBase.set(false);
        const p = readProblem(err);
        const rest = applyFieldProblems(p.fieldErrors, (path) =>
          this.baseForm.get(path.replace(/^body\.(region\.)?/, '')),
        );
        this.baseProblem.set([p.message, ...rest].join(' '));
      },
    });
  }

  protected baseError(name: string): string {
    const e = this.baseForm.get(name)?.errors;
    if (!e) return '';
    if (e['server']) return String(e['server']);
    if (e['required']) return 'Required';
    if (e['min']) return `At least ${(e['min'] as { min: number }).min}`;
    return 'Check this value';
  }
}
