import { ChangeDetectionStrategy, Component, computed, input } from '@angular/core';
import type { CalibrationFit } from '@clearbase/contracts';
import { DensityChart, type DensitySeries } from '../charts/density-chart';

const channels = ['red', 'green', 'blue'] as const;
// the fitted straight line reaches 15 % past each end of the straight part, to show where it leaves the curve: our choice
const fitOvershoot = 0.15;

/**
 * A calibration's three characteristic curves: each channel's fitted curve (through its control points), the
 * least-squares straight line over its straight part (dashed, a little beyond it) and the grey frames as dots.
 */
@Component({
  selector: 'cb-characteristic-plot',
  imports: [DensityChart],
  template: `<cb-density-chart
    [series]="series()"
    label="Characteristic curves: density against log exposure, red, green and blue, with fitted straight lines"
    exposureLabel="log H (0 = metered grey)"
    testId="characteristic-plot"
    [markRadius]="2.5"
  />`,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class CharacteristicPlot {
  readonly fit = input.required<Pick<CalibrationFit, 'curves' | 'greyPoints'>>();

  protected readonly series = computed(() => {
    const f = this.fit();
    return channels.map((channel, c): DensitySeries => {
      const curve = f.curves[channel];
      const { from, to, intercept } = curve.straightPart;
      const pad = fitOvershoot * (to - from);
      const on = (logExposure: number) => ({ logExposure, density: intercept + curve.gamma * logExposure });
      return {
        channel,
        curve: curve.points,
        marks: f.greyPoints.map((p) => ({ logExposure: p.logExposure, density: p.densities[c]! })),
        fit: { from: on(from - pad), to: on(to + pad) },
      };
    });
  });
}
