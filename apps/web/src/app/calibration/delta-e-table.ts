import { ChangeDetectionStrategy, Component, input } from '@angular/core';
import type { CalibrationFit } from '@clearbase/contracts';

/** ΔE00 as the table prints it: two decimals, a dash when the patch was not measured. */
export function formatDeltaE(v: number | null): string {
  return v === null || !Number.isFinite(v) ? '–' : v.toFixed(2);
}

/**
 * The chart's patches: reference and result swatches side by side, ΔE00 before the colour matrices, after them
 * (training: the fit saw the patch) and cross-validated (the patch predicted by a fit without it), with the means,
 * the neutral row and a warning when the cross-validated figures show the fit memorising the chart.
 */
@Component({
  selector: 'cb-delta-e-table',
  template: `
    <table data-testid="delta-e-table">
      <thead>
        <tr>
          <th>#</th>
          <th>Patch</th>
          <th>Reference · result</th>
          <th>ΔE00 before</th>
          <th>ΔE00 after (training)</th>
          <th>ΔE00 cross-validated</th>
          <th></th>
        </tr>
      </thead>
      <tbody>
        @for (p of deltaE().patches; track p.index) {
          <tr data-testid="delta-e-row">
            <td>{{ p.index }}</td>
            <td>{{ p.name }}</td>
            <td class="swatches">
              <span
                class="swatch"
                [style.background]="p.referenceHex"
                [attr.title]="'reference ' + p.referenceHex"
                data-testid="swatch-reference"
              ></span>
              <span
                class="swatch"
                [style.background]="p.afterHex ?? 'transparent'"
                [attr.title]="p.afterHex ? 'result ' + p.afterHex : 'not measured'"
                data-testid="swatch-result"
              ></span>
            </td>
            <td class="num">{{ formatDeltaE(p.deltaEBefore) }}</td>
            <td class="num" [class.large]="(p.deltaEAfter ?? 0) > 3">{{ formatDeltaE(p.deltaEAfter) }}</td>
            <td class="num" [class.large]="(p.deltaECrossValidated ?? 0) > 3">
              {{ formatDeltaE(p.deltaECrossValidated) }}
            </td>
            <td class="note">
              {{ !p.measured ? 'not measured' : p.inGamut ? '' : 'outside sRGB: not in the means' }}
            </td>
          </tr>
        }
      </tbody>
      <tfoot>
        <tr>
          <td colspan="3">Mean over in-gamut patches (max)</td>
          <td class="num" data-testid="mean-before">
            {{ formatDeltaE(deltaE().before.mean) }} ({{ formatDeltaE(deltaE().before.max) }})
          </td>
          <td class="num" data-testid="mean-after">
            {{ formatDeltaE(deltaE().after.mean) }} ({{ formatDeltaE(deltaE().after.max) }})
          </td>
          <td class="num" data-testid="mean-cross-validated">
            {{ formatDeltaE(deltaE().crossValidated?.mean ?? null) }}
            ({{ formatDeltaE(deltaE().crossValidated?.max ?? null) }})
          </td>
          <td></td>
        </tr>
      </tfoot>
    </table>
    @if (deltaE().neutral; as n) {
      <p data-testid="neutral-row">
        Neutral row with the profile: largest |Δa*| {{ formatDeltaE(n.a) }}, |Δb*| {{ formatDeltaE(n.b) }}
      </p>
    }
    @if (deltaE().memorisedChart) {
      <p class="large" data-testid="memorised-chart">
        The cross-validated ΔE00 lies well above the training figure: the colour fit follows this chart more
        than the film. Add chart frames at other exposures or check the chart for glare and dust.
      </p>
    }
  `,
  styles: `
    table {
      border-collapse: collapse;
    }
    th,
    td {
      text-align: left;
      padding: 3px 12px 3px 0;
    }
    .num {
      text-align: right;
      font-variant-numeric: tabular-nums;
    }
    .swatches {
      display: flex;
    }
    .swatch {
      display: inline-block;
      width: 40px;
      height: 24px;
    }
    .large {
      color: var(--mat-sys-error);
    }
    .note {
      color: var(--mat-sys-on-surface-variant);
      font-size: 0.85em;
    }
    tfoot td {
      font-weight: 600;
      border-top: 1px solid var(--mat-sys-outline-variant);
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class DeltaETable {
  readonly deltaE = input.required<CalibrationFit['deltaE']>();
  protected readonly formatDeltaE = formatDeltaE;
}
