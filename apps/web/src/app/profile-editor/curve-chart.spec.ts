import { provideZonelessChangeDetection } from '@angular/core';
import { TestBed } from '@angular/core/testing';
import type { EditablePoint } from './curve-point-problems';
import { CurveChart } from './curve-chart';
import type { Channel } from './profile-form';

const line = (top: number): EditablePoint[] => [
  { logExposure: -3, density: 0 },
  { logExposure: -1.5, density: top / 2 },
  { logExposure: 0, density: top },
];

async function chart(curves: Record<Channel, readonly EditablePoint[]>): Promise<SVGSVGElement> {
  TestBed.configureTestingModule({ imports: [CurveChart], providers: [provideZonelessChangeDetection()] });
  const fixture = TestBed.createComponent(CurveChart);
  fixture.componentRef.setInput('curves', curves);
  await fixture.whenStable();
  return (fixture.nativeElement as HTMLElement).querySelector('svg')!;
}

describe('the curve chart', () => {
  it('draws the three channels in one chart with axes labelled log H and D', async () => {
    const svg = await chart({ red: line(1.8), green: line(1.86), blue: line(1.92) });
    const labels = Array.from(svg.querySelectorAll('.axis-label')).map((t) => t.textContent?.trim());
    expect(labels).toEqual(['log H', 'D']);
    for (const c of ['red', 'green', 'blue']) {
      const path = svg.querySelector(`[data-testid="curve-${c}"]`)!.getAttribute('d')!;
      expect(path.startsWith('M')).toBe(true);
      expect(path.split('L').length).toBeGreaterThan(10);
    }
    expect(svg.querySelectorAll('circle.point')).toHaveLength(9);
  });

  it('puts a denser channel higher: the blue line ends above the red one', async () => {
    const svg = await chart({ red: line(1.5), green: line(1.7), blue: line(2) });
    const lastY = (c: string) => {
      const d = svg.querySelector(`[data-testid="curve-${c}"]`)!.getAttribute('d')!;
      return Number(d.split('L').at(-1)!.split(',')[1]);
    };
    // SVG y grows downward
    expect(lastY('blue')).toBeLessThan(lastY('red'));
  });

  it('joins the points of a curve that does not increase with straight segments instead of a fitted curve', async () => {
    const faulty: EditablePoint[] = [
      { logExposure: -3, density: 0 },
      { logExposure: -3, density: 1 },
      { logExposure: 0, density: 1.8 },
    ];
    const svg = await chart({ red: faulty, green: line(1.86), blue: line(1.92) });
    const path = svg.querySelector('[data-testid="curve-red"]')!.getAttribute('d')!;
    expect(path.split('L')).toHaveLength(3);
  });
});
