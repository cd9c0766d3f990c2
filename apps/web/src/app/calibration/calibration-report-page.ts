import { ChangeDetectionStrategy, Component, computed, inject, input } from '@angular/core';
import { toObservable, toSignal } from '@angular/core/rxjs-interop';
import { MatAnchor } from '@angular/material/button';
import { MatIcon } from '@angular/material/icon';
import { MatProgressBar } from '@angular/material/progress-bar';
import { RouterLink } from '@angular/router';
import type { Calibration } from '@clearbase/contracts';
import { catchError, map, of, startWith, switchMap } from 'rxjs';
import { readProblem } from '../problem/read-problem';
import { CalibrationApi } from './calibration-api';
import { CharacteristicPlot } from './characteristic-plot';
import { DeltaETable } from './delta-e-table';

interface ReportView {
  loading: boolean;
  calibration: Calibration | null;
  problem: string | null;
}

const channels = ['red', 'green', 'blue'] as const;
const axes = [
  { key: 'cyanRed', label: 'Cyan–red' },
  { key: 'magentaGreen', label: 'Magenta–green' },
  { key: 'yellowBlue', label: 'Yellow–blue' },
] as const;

/** A calibration's report: curves with fitted lines, γ, speed point and EI, ΔE00 per patch, spread, warnings. */
@Component({
  selector: 'cb-calibration-report-page',
  imports: [RouterLink, MatAnchor, MatIcon, MatProgressBar, CharacteristicPlot, DeltaETable],
  templateUrl: './calibration-report-page.html',
  styleUrl: './calibration-page.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class CalibrationReportPage {
  private readonly api = inject(CalibrationApi);
  /** Route parameter. */
  readonly id = input.required<string>();

  protected readonly channels = channels;
  protected readonly axes = axes;
  protected readonly view = toSignal(
    toObservable(this.id).pipe(
      switchMap((id) =>
        this.api.get(Number(id)).pipe(
          map((calibration): ReportView => ({ loading: false, calibration, problem: null })),
          catchError((err: unknown) =>
            of<ReportView>({ loading: false, calibration: null, problem: readProblem(err).message }),
          ),
          startWith<ReportView>({ loading: true, calibration: null, problem: null }),
        ),
      ),
    ),
    { initialValue: { loading: true, calibration: null, problem: null } as ReportView },
  );
  protected readonly warnings = computed(
    () => this.view().calibration?.warnings.filter((w) => w.severity === 'warning') ?? [],
  );
  protected readonly notices = computed(
    () => this.view().calibration?.warnings.filter((w) => w.severity === 'notice') ?? [],
  );
  protected readonly chartFrame = computed(
    () => this.view().calibration?.inputs.frames.find((f) => f.role === 'chart') ?? null,
  );

  protected reportUrl(id: number): string {
    return this.api.reportUrl(id);
  }

  protected frameUrl(id: number, n: number): string {
    return this.api.frameUrl(id, n);
  }

  protected fixed(v: number, digits = 2): string {
    return v.toFixed(digits);
  }

  protected signed(v: number, digits = 1): string {
    return `${v > 0 ? '+' : ''}${v.toFixed(digits)}`;
  }
}
