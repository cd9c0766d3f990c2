import { ChangeDetectionStrategy, Component, computed, input } from '@angular/core';
import { DensityChart, type DensitySeries } from '../charts/density-chart';
import { curvePointProblems, type EditablePoint } from './curve-point-problems';
import { channels, type Channel } from './profile-form';

/**
 * The profile's characteristic curves as the editor's table holds them: the curve the inversion uses through each
 * channel's points, or straight segments while the points do not make a valid curve yet.
 */
@Component({
  selector: 'cb-curve-chart',
  imports: [DensityChart],
  template: `<cb-density-chart [series]="series()" [label]="label" testId="curve-chart" />`,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class CurveChart {
  /** Each channel's control points, as the editor's table holds them. */
  readonly curves = input.required<Record<Channel, readonly EditablePoint[]>>();

  protected readonly label = `Characteristic curves: density D against log exposure log H, ${channels.join(', ')} channels`;

  protected readonly series = computed(() => {
    const curves = this.curves();
    return channels.map((channel): DensitySeries => {
      const points = curves[channel].filter(
        (p): p is { logExposure: number; density: number } =>
          p.logExposure !== null &&
          p.density !== null &&
          Number.isFinite(p.logExposure) &&
          Number.isFinite(p.density),
      );
      const smooth = curvePointProblems(curves[channel]).length === 0;
      return { channel, curve: points, smooth, marks: points };
    });
  });
}
