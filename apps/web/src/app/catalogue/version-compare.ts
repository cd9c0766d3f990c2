import {
  ChangeDetectionStrategy,
  Component,
  computed,
  inject,
  input,
  linkedSignal,
  signal,
} from '@angular/core';
import { MatButton } from '@angular/material/button';
import { MatFormField, MatLabel } from '@angular/material/form-field';
import { MatOption, MatSelect } from '@angular/material/select';
import type { ProfileDiff } from '@clearbase/contracts';
import { readProblem } from '../problem/read-problem';
import { CatalogueApi } from './catalogue-api';
import type { ProfileWithVersions } from './version-timeline';

/** A parameter's value as the comparison table prints it. */
export function parameterText(value: unknown): string {
  if (value === undefined) return '—';
  return typeof value === 'string' ? value : JSON.stringify(value);
}

/** Staff: picks two versions of a profile and lists every parameter that differs, with before and after. */
@Component({
  selector: 'cb-version-compare',
  imports: [MatFormField, MatLabel, MatSelect, MatOption, MatButton],
  template: `
    <div class="pickers">
      <mat-form-field appearance="outline" subscriptSizing="dynamic">
        <mat-label>From version</mat-label>
        <mat-select
          [value]="fromId()"
          (selectionChange)="fromId.set($event.value)"
          [attr.data-testid]="'compare-from-' + profile().id"
        >
          @for (v of versions(); track v.id) {
            <mat-option [value]="v.id">Version {{ v.version }}</mat-option>
          }
        </mat-select>
      </mat-form-field>
      <mat-form-field appearance="outline" subscriptSizing="dynamic">
        <mat-label>To version</mat-label>
        <mat-select
          [value]="toId()"
          (selectionChange)="toId.set($event.value)"
          [attr.data-testid]="'compare-to-' + profile().id"
        >
          @for (v of versions(); track v.id) {
            <mat-option [value]="v.id">Version {{ v.version }}</mat-option>
          }
        </mat-select>
      </mat-form-field>
      <button
        mat-stroked-button
        type="button"
        (click)="compare()"
        [disabled]="!canCompare() || busy()"
        [attr.data-testid]="'compare-run-' + profile().id"
      >
        Compare
      </button>
    </div>
    @if (problem(); as message) {
      <div class="cb-problem" role="alert">{{ message }}</div>
    }
    @if (diff(); as d) {
      @if (d.changes.length === 0) {
        <p class="muted" [attr.data-testid]="'compare-same-' + profile().id">
          The two versions have the same parameters.
        </p>
      } @else {
        <table class="diff" [attr.data-testid]="'compare-table-' + profile().id">
          <thead>
            <tr>
              <th scope="col">Parameter</th>
              <th scope="col">Before</th>
              <th scope="col">After</th>
            </tr>
          </thead>
          <tbody>
            @for (c of d.changes; track c.path) {
              <tr>
                <td class="path">{{ c.path }}</td>
                <td>{{ text(c.before) }}</td>
                <td>{{ text(c.after) }}</td>
              </tr>
            }
          </tbody>
        </table>
      }
    }
  `,
  styles: `
    .pickers {
      display: flex;
      flex-wrap: wrap;
      align-items: center;
      gap: 12px;
      margin-bottom: 12px;
    }
    mat-form-field {
      width: 160px;
    }
    .diff {
      border-collapse: collapse;
      width: 100%;
      font: var(--mat-sys-body-medium);
    }
    .diff th,
    .diff td {
      text-align: left;
      padding: 6px 12px;
      border-bottom: 1px solid var(--mat-sys-outline-variant);
      vertical-align: top;
      word-break: break-word;
    }
    .diff th {
      font: var(--mat-sys-label-large);
      color: var(--mat-sys-on-surface-variant);
    }
    .path {
      font-family: ui-monospace, 'DejaVu Sans Mono', monospace;
    }
    .muted {
      color: var(--mat-sys-on-surface-variant);
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class VersionCompare {
  private readonly api = inject(CatalogueApi);

  readonly profile = input.required<ProfileWithVersions>();

  protected readonly versions = computed(() =>
    [...this.profile().versions].sort((a, b) => b.version - a.version),
  );
  /** Newest but one, else the only version. */
  protected readonly fromId = linkedSignal(() => (this.versions()[1] ?? this.versions()[0])?.id ?? null);
  /** The newest version. */
  protected readonly toId = linkedSignal(() => this.versions()[0]?.id ?? null);
  protected readonly canCompare = computed(() => this.fromId() !== null && this.toId() !== null);
  protected readonly busy = signal(false);
  protected readonly diff = signal<ProfileDiff | null>(null);
  protected readonly problem = signal<string | null>(null);
  protected readonly text = parameterText;

  protected compare(): void {
    const from = this.fromId();
    const to = this.toId();
    if (from === null || to === null) return;
    this.busy.set(true);
    this.problem.set(null);
    this.api.diff(from, to).subscribe({
      next: (diff) => {
        this.busy.set(false);
        this.diff.set(diff);
      },
      error: (err: unknown) => {
        this.busy.set(false);
        this.diff.set(null);
        this.problem.set(readProblem(err).message);
      },
    });
  }
}
