import { ChangeDetectionStrategy, Component, computed, inject, signal } from '@angular/core';
import { toSignal } from '@angular/core/rxjs-interop';
import { FormArray, FormControl, FormGroup, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButton, MatIconButton } from '@angular/material/button';
import { MatError, MatFormField, MatLabel } from '@angular/material/form-field';
import { MatIcon } from '@angular/material/icon';
import { MatProgressBar } from '@angular/material/progress-bar';
import { MatOption, MatSelect } from '@angular/material/select';
import { ActivatedRoute, Router, RouterLink } from '@angular/router';
import type { FramePoint, PixelRegion } from '@clearbase/contracts';
import { catchError, forkJoin, of } from 'rxjs';
import { readProblem } from '../problem/read-problem';
import { CalibrationApi, type CalibrationRollOnFile, type FramePreview } from './calibration-api';
import { centralHalf } from './chart-overlay';
import { FrameMarker } from './frame-marker';

// ±10 stops: the server's bounds on a bracket frame's exposure (libs/contracts calibrations)
const stopsRange = { min: -10, max: 10 } as const;

/** A grey frame's row of the bracket table: the file and its stops. */
type BracketRow = FormGroup<{ stops: FormControl<number | null> }>;

/** Stops guessed from a file name ending in a signed number, e.g. grey+1.5.tif or grey_-2.tif; else null. */
export function stopsFromFileName(name: string): number | null {
  // a minus only counts after a space, underscore or bracket: "grey-03" is a frame number, not −3 stops
  const m = /(?:\+|(?:^|[\s_(])[+-])(\d+(?:\.\d+)?)(?:\s*(?:ev|stops?))?\.[a-z0-9]+$/i.exec(name);
  if (!m) return null;
  return m[0].includes('-') ? -Number(m[1]) : Number(m[1]);
}

/**
 * Staff: builds a profile for a new emulsion from a calibration roll. The operator picks the stock, adds the grey
 * bracket frames with their stops, the chart frame (clicking its four corners on the preview, the patch grid drawn
 * over it) and optionally a leader; a rectangle dragged on the first grey frame is sampled on every grey frame.
 * A roll on file (frames the lab already holds, with their stops) loads in one step; `?stock=ID` picks the stock.
 */
@Component({
  selector: 'cb-calibration-page',
  imports: [
    ReactiveFormsModule,
    RouterLink,
    MatButton,
    MatIconButton,
    MatIcon,
    MatFormField,
    MatLabel,
    MatError,
    MatSelect,
    MatOption,
    MatProgressBar,
    FrameMarker,
  ],
  templateUrl: './calibration-page.html',
  styleUrl: './calibration-page.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class CalibrationPage {
  private readonly api = inject(CalibrationApi);
  private readonly router = inject(Router);
  private readonly route = inject(ActivatedRoute);

  protected readonly stocks = toSignal(this.api.stocks().pipe(catchError(() => of([]))), {
    initialValue: [],
  });
  protected readonly recent = toSignal(this.api.list().pipe(catchError(() => of([]))), { initialValue: [] });
  protected readonly rollsOnFile = toSignal(this.api.rollsOnFile().pipe(catchError(() => of([]))), {
    initialValue: [],
  });
  /** The roll on file whose frames are loaded, or being loaded. */
  protected readonly loadedRoll = signal<CalibrationRollOnFile | null>(null);
  protected readonly loadingRoll = signal(false);
  protected readonly form = new FormGroup({
    stockId: new FormControl<number | null>(
      Number(this.route.snapshot.queryParamMap.get('stock')) || null,
      Validators.required,
    ),
    bracket: new FormArray<BracketRow>([]),
  });
  protected readonly greyFiles = signal<File[]>([]);
  protected readonly chartFile = signal<File | null>(null);
  protected readonly leaderFile = signal<File | null>(null);
  protected readonly chartPreview = signal<FramePreview | null>(null);
  protected readonly greyPreview = signal<FramePreview | null>(null);
  protected readonly corners = signal<FramePoint[]>([]);
  protected readonly greyRegion = signal<PixelRegion | null>(null);
  protected readonly busy = signal(false);
  protected readonly problem = signal<string | null>(null);
  protected readonly fieldProblems = signal<string[]>([]);

  protected readonly ready = computed(
    () =>
      this.greyFiles().length >= 2 &&
      this.chartFile() !== null &&
      this.corners().length === 4 &&
      this.greyRegion() !== null,
  );

  protected get rows(): BracketRow[] {
    return this.form.controls.bracket.controls;
  }

  protected addGreyFiles(input: HTMLInputElement): void {
    const files = [...(input.files ?? [])].sort((a, b) =>
      a.name.localeCompare(b.name, undefined, { numeric: true }),
    );
    input.value = '';
    this.addGrey(files.map((file) => ({ file, stops: stopsFromFileName(file.name) })));
  }

  private addGrey(frames: { file: File; stops: number | null }[]): void {
    if (!frames.length) return;
    const first = this.greyFiles().length === 0;
    this.greyFiles.update((fs) => [...fs, ...frames.map((f) => f.file)]);
    for (const f of frames)
      this.form.controls.bracket.push(
        new FormGroup({
          stops: new FormControl<number | null>(f.stops, [
            Validators.required,
            Validators.min(stopsRange.min),
            Validators.max(stopsRange.max),
          ]),
        }),
      );
    if (first) this.loadPreview(frames[0]!.file, 'grey');
  }

  /** Loads a roll on file in place of whatever was chosen: its stock, grey frames with their stops, chart, leader. */
  protected loadRoll(roll: CalibrationRollOnFile): void {
    const frames = roll.frames;
    if (!frames.some((f) => f.role === 'chart')) return;
    this.loadingRoll.set(true);
    this.problem.set(null);
    forkJoin(frames.map((f) => this.api.frameOnFile(roll, f))).subscribe({
      next: (files) => {
        this.loadingRoll.set(false);
        this.loadedRoll.set(roll);
        this.form.controls.stockId.setValue(roll.stockId);
        this.form.controls.bracket.clear();
        this.greyFiles.set([]);
        this.greyPreview.set(null);
        this.greyRegion.set(null);
        this.addGrey(
          frames.flatMap((f, i) => (f.role === 'bracket' ? [{ file: files[i]!, stops: f.stops }] : [])),
        );
        this.useChart(files[frames.findIndex((f) => f.role === 'chart')]!);
        const leader = frames.findIndex((f) => f.role === 'leader');
        this.leaderFile.set(leader >= 0 ? files[leader]! : null);
      },
      error: (err: unknown) => {
        this.loadingRoll.set(false);
        this.problem.set(`${roll.title}: ${readProblem(err).message}`);
      },
    });
  }

  protected frameSummary(roll: CalibrationRollOnFile): string {
    const grey = roll.frames.filter((f) => f.role === 'bracket').length;
    const leader = roll.frames.some((f) => f.role === 'leader');
    return `${grey} grey frames, the chart${leader ? ' and a leader' : ''}`;
  }

  protected removeGrey(i: number): void {
    this.greyFiles.update((fs) => fs.filter((_, k) => k !== i));
    this.form.controls.bracket.removeAt(i);
    if (i === 0) {
      const next = this.greyFiles()[0];
      this.greyPreview.set(null);
      this.greyRegion.set(null);
      if (next) this.loadPreview(next, 'grey');
    }
  }

  protected setChart(input: HTMLInputElement): void {
    this.useChart(input.files?.[0] ?? null);
  }

  private useChart(file: File | null): void {
    this.chartFile.set(file);
    this.corners.set([]);
    this.chartPreview.set(null);
    if (file) this.loadPreview(file, 'chart');
  }

  protected setLeader(input: HTMLInputElement): void {
    this.leaderFile.set(input.files?.[0] ?? null);
  }

  protected clearCorners(): void {
    this.corners.set([]);
  }

  private loadPreview(file: File, which: 'grey' | 'chart'): void {
    this.api.framePreview(file).subscribe({
      next: (preview) => {
        if (which === 'chart') this.chartPreview.set(preview);
        else {
          this.greyPreview.set(preview);
          if (!this.greyRegion()) this.greyRegion.set(centralHalf(preview));
        }
      },
      error: (err: unknown) => this.problem.set(`${file.name}: ${readProblem(err).message}`),
    });
  }

  protected submit(): void {
    this.form.markAllAsTouched();
    const chart = this.chartFile();
    const region = this.greyRegion();
    if (this.form.invalid || !chart || !region || this.corners().length !== 4) return;
    this.busy.set(true);
    this.problem.set(null);
    this.fieldProblems.set([]);
    const value = this.form.getRawValue();
    this.api
      .create(
        {
          stockId: value.stockId!,
          bracket: value.bracket.map((b) => ({ stops: b.stops! })),
          greyRegion: region,
          chartCorners: this.corners() as [FramePoint, FramePoint, FramePoint, FramePoint],
        },
        { bracket: this.greyFiles(), chart, leader: this.leaderFile() },
      )
      .subscribe({
        next: (calibration) => void this.router.navigate(['/calibration', calibration.id]),
        error: (err: unknown) => {
          const p = readProblem(err);
          this.busy.set(false);
          this.problem.set(p.message);
          this.fieldProblems.set(Object.entries(p.fieldErrors).map(([path, m]) => `${path}: ${m}`));
        },
      });
  }
}
