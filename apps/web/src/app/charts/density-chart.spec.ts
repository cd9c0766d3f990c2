import { provideZonelessChangeDetection } from '@angular/core';
import { TestBed } from '@angular/core/testing';
import { DensityChart, type DensitySeries } from './density-chart';

const line = (top: number) => [
  { logExposure: -2, density: 0 },
  { logExposure: -1, density: top / 2 },
  { logExposure: 0, density: top },
];

async function chart(series: DensitySeries[], inputs: Record<string, unknown> = {}): Promise<SVGSVGElement> {
  TestBed.configureTestingModule({ imports: [DensityChart], providers: [provideZonelessChangeDetection()] });
  const fixture = TestBed.createComponent(DensityChart);
  fixture.componentRef.setInput('series', series);
  fixture.componentRef.setInput('label', 'Curves of a test');
  for (const [name, value] of Object.entries(inputs)) fixture.componentRef.setInput(name, value);
  await fixture.whenStable();
  return (fixture.nativeElement as HTMLElement).querySelector('svg')!;
}

describe('the density chart', () => {
  it('spans the axes over every curve and mark in halves, density from zero', async () => {
    const svg = await chart([
      { channel: 'red', curve: line(1.2), marks: [{ logExposure: 0.4, density: 1.4 }] },
    ]);
    const ticks = Array.from(svg.querySelectorAll('.tick')).map((t) => t.textContent?.trim());
    expect(ticks).toEqual(['-2', '-1.5', '-1', '-0.5', '0', '0.5', '0', '0.5', '1', '1.5']);
    expect(svg.getAttribute('aria-label')).toBe('Curves of a test');
    expect(svg.getAttribute('data-testid')).toBe('density-chart');
  });

  it('draws straight segments through the points, or a sampled smooth curve when asked', async () => {
    const svg = await chart([
      { channel: 'red', curve: line(1), marks: [] },
      { channel: 'green', curve: line(1), smooth: true, marks: [] },
    ]);
    const red = svg.querySelector('[data-testid="curve-red"]')!.getAttribute('d')!;
    // (−2, 0) at the left bottom corner of the plot, (0, 1) at the right top
    expect(red).toBe('M48.0,260.0L256.0,138.0L464.0,16.0');
    const green = svg.querySelector('[data-testid="curve-green"]')!.getAttribute('d')!;
    expect(green.split('L').length).toBeGreaterThan(90);
  });

  it('marks points with dots of the radius given, and draws a dashed fit where there is one', async () => {
    const svg = await chart(
      [
        {
          channel: 'blue',
          curve: line(1),
          marks: [
            { logExposure: -1, density: 0.5 },
            { logExposure: 0, density: 1 },
          ],
          fit: { from: { logExposure: -2, density: 0 }, to: { logExposure: 0, density: 1 } },
        },
      ],
      { markRadius: 2.5, exposureLabel: 'log H (0 = metered grey)', testId: 'characteristic-plot' },
    );
    const dots = Array.from(svg.querySelectorAll('circle.point.blue'));
    expect(dots.map((d) => d.getAttribute('r'))).toEqual(['2.5', '2.5']);
    const fit = svg.querySelector('[data-testid="fit-blue"]')!;
    expect([
      fit.getAttribute('x1'),
      fit.getAttribute('y1'),
      fit.getAttribute('x2'),
      fit.getAttribute('y2'),
    ]).toEqual(['48', '260', '464', '16']);
    expect(svg.querySelector('.axis-label')!.textContent!.trim()).toBe('log H (0 = metered grey)');
    expect(svg.getAttribute('data-testid')).toBe('characteristic-plot');
  });
});
