import { ChangeDetectionStrategy, Component, input, output } from '@angular/core';
import { ReactiveFormsModule } from '@angular/forms';
import { MatIconButton } from '@angular/material/button';
import { MatError, MatFormField } from '@angular/material/form-field';
import { MatIcon } from '@angular/material/icon';
import { MatInput } from '@angular/material/input';
import { MatTooltip } from '@angular/material/tooltip';
import type { CurvePointProblem } from './curve-point-problems';
import { createPointGroup, type Channel, type PointsArray } from './profile-form';

// A new last point one half log H further on, 0.3 D higher: about a γ of 0.6 (common practice of the trade, from memory).
const newPointStep = { logExposure: 0.5, density: 0.3 } as const;

/** One channel's control points as an editable table: log H and D per row, rows added and removed. */
@Component({
  selector: 'cb-curve-table',
  imports: [ReactiveFormsModule, MatFormField, MatError, MatInput, MatIconButton, MatIcon, MatTooltip],
  template: `
    <table class="points" [attr.data-testid]="'curve-table-' + channel()">
      <thead>
        <tr>
          <th scope="col">#</th>
          <th scope="col">log H</th>
          <th scope="col">D</th>
          <th scope="col"><span class="cdk-visually-hidden">Row actions</span></th>
        </tr>
      </thead>
      <tbody>
        @for (row of points().controls; track row; let i = $index) {
          <tr [formGroup]="row" [class.faulty]="faultyRows().has(i)">
            <td class="index">{{ i + 1 }}</td>
            @for (field of fields; track field) {
              <td>
                <mat-form-field appearance="outline" subscriptSizing="dynamic" class="cb-compact cell">
                  <input
                    matInput
                    type="number"
                    step="0.01"
                    [formControlName]="field"
                    [attr.aria-label]="(field === 'logExposure' ? 'log H' : 'D') + ' of point ' + (i + 1)"
                    [attr.data-testid]="'curve-' + channel() + '-' + i + '-' + field"
                  />
                  @if (row.controls[field].getError('server'); as message) {
                    <mat-error>{{ message }}</mat-error>
                  }
                </mat-form-field>
              </td>
            }
            <td class="actions">
              <button
                mat-icon-button
                type="button"
                (click)="insertAfter(i)"
                [disabled]="points().disabled"
                matTooltip="Add a point after this one"
                [attr.aria-label]="'Add a point after point ' + (i + 1)"
              >
                <mat-icon>add</mat-icon>
              </button>
              <button
                mat-icon-button
                type="button"
                (click)="remove(i)"
                [disabled]="points().disabled || points().length <= 2"
                matTooltip="Remove this point"
                [attr.aria-label]="'Remove point ' + (i + 1)"
                [attr.data-testid]="'curve-' + channel() + '-' + i + '-remove'"
              >
                <mat-icon>delete</mat-icon>
              </button>
            </td>
          </tr>
        }
      </tbody>
    </table>
    @if (problems().length) {
      <ul class="problems" role="alert" [attr.data-testid]="'curve-problems-' + channel()">
        @for (p of problems(); track $index) {
          <li>{{ p.message }}</li>
        }
      </ul>
    }
  `,
  styles: `
    .points {
      border-collapse: collapse;
      width: 100%;
    }
    th {
      text-align: left;
      font: var(--mat-sys-label-medium);
      color: var(--mat-sys-on-surface-variant);
      padding: 4px;
    }
    td {
      padding: 2px 4px;
    }
    .index {
      color: var(--mat-sys-on-surface-variant);
      width: 2em;
    }
    .cell {
      width: 100%;
    }
    /* the form field's own minimum width (180px) would push the D column out of a narrow card */
    :host ::ng-deep .cell .mat-mdc-form-field-infix {
      width: auto;
      min-width: 48px;
    }
    .actions {
      white-space: nowrap;
      width: 96px;
    }
    tr.faulty .index {
      color: var(--mat-sys-error);
      font-weight: 600;
    }
    .problems {
      color: var(--mat-sys-error);
      font: var(--mat-sys-body-small);
      margin: 8px 0 0;
      padding-left: 20px;
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class CurveTable {
  readonly channel = input.required<Channel>();
  readonly points = input.required<PointsArray>();
  /** The array validator's findings, passed in so they follow the form's value signal. */
  readonly problems = input<readonly CurvePointProblem[]>([]);
  /** Emitted after a row is added or removed. */
  readonly changed = output<void>();

  protected readonly fields = ['logExposure', 'density'] as const;

  protected faultyRows(): ReadonlySet<number> {
    return new Set(this.problems().map((p) => p.index));
  }

  protected insertAfter(i: number): void {
    const rows = this.points();
    const here = rows.at(i).getRawValue();
    const next = i + 1 < rows.length ? rows.at(i + 1).getRawValue() : null;
    const point =
      next &&
      here.logExposure !== null &&
      here.density !== null &&
      next.logExposure !== null &&
      next.density !== null
        ? {
            logExposure: (here.logExposure + next.logExposure) / 2,
            density: (here.density + next.density) / 2,
          }
        : {
            logExposure: (here.logExposure ?? 0) + newPointStep.logExposure,
            density: (here.density ?? 0) + newPointStep.density,
          };
    const round = (v: number) => Math.round(v * 1e4) / 1e4;
    rows.insert(
      i + 1,
      createPointGroup({ logExposure: round(point.logExposure), density: round(point.density) }),
    );
    rows.markAsDirty();
    this.changed.emit();
  }

  protected remove(i: number): void {
    const rows = this.points();
    if (rows.length <= 2) return;
    rows.removeAt(i);
    rows.markAsDirty();
    this.changed.emit();
  }
}
