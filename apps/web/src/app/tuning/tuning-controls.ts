import { DecimalPipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, computed, inject } from '@angular/core';
import { FormsModule } from '@angular/forms';
import { MatButton } from '@angular/material/button';
import { MatButtonToggle, MatButtonToggleGroup } from '@angular/material/button-toggle';
import { MatSlideToggle } from '@angular/material/slide-toggle';
import { PreviewRenderer } from '../preview/preview-renderer';
import { densityHistogram, positiveHistogram, type Histogram } from './histograms';
import { stopsLabel } from './stops-label';
import { TuningSession } from './tuning-session';

/** The three casts in the positive's terms (positive values: more red, green, blue). */
const castAxes = [
  { key: 'cyanRed', label: 'Cyan – red', hint: '+ redder, − more cyan' },
  { key: 'magentaGreen', label: 'Magenta – green', hint: '+ greener, − more magenta' },
  { key: 'yellowBlue', label: 'Yellow – blue', hint: '+ bluer, − more yellow' },
] as const;

/** The black and white point controls: which shift each moves, and what a positive move does. */
const pointControls = [
  {
    key: 'blackPointStops',
    label: 'Black point',
    id: 'black-point',
    valueId: 'blackPoint',
    hint: '+ deeper blacks, − lifted shadows',
  },
  {
    key: 'whitePointStops',
    label: 'White point',
    id: 'white-point',
    valueId: 'whitePoint',
    hint: '+ dimmer highlights, − brighter highlights',
  },
] as const;

/**
 * The tuning controls: whether the frame or the whole roll is tuned, casts in whole printer points, exposure and
 * the black and white points in sixths of a stop, contrast; reset and copy to the selected frames; the negative's
 * and the positive's histograms; and the review of the selected frame.
 */
@Component({
  selector: 'cb-tuning-controls',
  imports: [DecimalPipe, FormsModule, MatButton, MatButtonToggleGroup, MatButtonToggle, MatSlideToggle],
  templateUrl: './tuning-controls.html',
  styleUrl: './tuning-controls.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class TuningControls {
  protected readonly session = inject(TuningSession);
  private readonly preview = inject(PreviewRenderer);
  protected readonly castAxes = castAxes;
  protected readonly pointControls = pointControls;
  protected readonly stopsLabel = stopsLabel;

  /** Where the contrast slider sits while the frame keeps the profile's contrast. */
  protected readonly profileContrast = computed(() => this.session.sheet()?.profile.tone.contrast ?? 1);
  private readonly densityBars = computed<Histogram | null>(() => {
    const n = this.session.negative();
    return n ? densityHistogram(n.pixels, n.base) : null;
  });
  private readonly positiveBars = computed<Histogram | null>(() => {
    const image = this.preview.after();
    return image ? positiveHistogram(image.rgba) : null;
  });
  /** The negative's densities and the positive's code values, once each is there. */
  protected readonly histograms = computed(() => {
    const density = this.densityBars();
    const positive = this.positiveBars();
    const shown: { bars: Histogram; label: string; caption: string }[] = [];
    if (density)
      shown.push({
        bars: density,
        label: 'Negative density per channel',
        caption: 'Negative: density above base 0–3',
      });
    if (positive)
      shown.push({ bars: positive, label: 'Positive code values per channel', caption: 'Positive: 0–255' });
    return shown;
  });

  protected sixths(stops: number): number {
    return Math.round(stops * 6);
  }

  /** An SVG path of one channel's bins, filled down to the axis, in a 100 × 40 box. */
  protected histogramPath(h: Histogram, channel: 0 | 1 | 2): string {
    const bins = h.bins[channel]!;
    const top = h.peak || 1;
    let d = `M0,40`;
    bins.forEach((v, i) => (d += ` L${(i * 100) / (bins.length - 1)},${40 - (40 * v) / top}`));
    return `${d} L100,40 Z`;
  }
}
