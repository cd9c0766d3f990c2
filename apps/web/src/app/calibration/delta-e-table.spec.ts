import { provideZonelessChangeDetection } from '@angular/core';
import { TestBed } from '@angular/core/testing';
import type { CalibrationFit } from '@clearbase/contracts';
import { DeltaETable, formatDeltaE } from './delta-e-table';

const deltaE: CalibrationFit['deltaE'] = {
  patches: [
    {
      index: 1,
      name: 'dark skin',
      reference: [37.8, 13.6, 14.1],
      after: [37.5, 13.9, 14.5],
      deltaEBefore: 2.412,
      deltaEAfter: 0.356,
      crossValidated: [37.2, 14.4, 15.0],
      deltaECrossValidated: 0.912,
      inGamut: true,
      measured: true,
      referenceHex: '#735244',
      afterHex: '#725345',
    },
    {
      index: 18,
      name: 'cyan',
      reference: [50.9, -28.6, -28.6],
      after: [52.0, -22.1, -25.2],
      deltaEBefore: 5.74,
      deltaEAfter: 4.0,
      crossValidated: [52.4, -20.9, -24.6],
      deltaECrossValidated: 4.6,
      inGamut: false,
      measured: true,
      referenceHex: '#008ca8',
      afterHex: '#2a8ba3',
    },
    {
      index: 24,
      name: 'black',
      reference: [20.5, 0, -0.5],
      after: null,
      deltaEBefore: null,
      deltaEAfter: null,
      crossValidated: null,
      deltaECrossValidated: null,
      inGamut: true,
      measured: false,
      referenceHex: '#343434',
      afterHex: null,
    },
  ],
  before: { mean: 2.412, max: 2.412 },
  after: { mean: 0.356, max: 0.356 },
  crossValidated: { mean: 0.912, max: 0.912 },
  neutral: { a: 0.3, b: 0.4 },
  frames: [{ exposureStops: 0.02, labelledStops: null, patchesUsed: 2, after: { mean: 0.356, max: 0.356 } }],
  memorisedChart: false,
};

function render(value: CalibrationFit['deltaE'] = deltaE) {
  TestBed.configureTestingModule({ imports: [DeltaETable], providers: [provideZonelessChangeDetection()] });
  const fixture = TestBed.createComponent(DeltaETable);
  fixture.componentRef.setInput('deltaE', value);
  fixture.detectChanges();
  return fixture.nativeElement as HTMLElement;
}

describe('DeltaETable', () => {
  it('shows each patch with reference and result swatches side by side and ΔE00 before and after', () => {
    const el = render();
    const rows = [...el.querySelectorAll('[data-testid="delta-e-row"]')];
    expect(rows).toHaveLength(3);
    const cells = [...rows[0]!.querySelectorAll('td')].map((td) => td.textContent?.trim());
    expect(cells).toEqual(['1', 'dark skin', '', '2.41', '0.36', '0.91', '']);
    const ref = rows[0]!.querySelector<HTMLElement>('[data-testid="swatch-reference"]')!;
    const res = rows[0]!.querySelector<HTMLElement>('[data-testid="swatch-result"]')!;
    expect(ref.style.background).toContain('rgb(115, 82, 68)');
    expect(res.style.background).toContain('rgb(114, 83, 69)');
    expect(ref.nextElementSibling).toBe(res);
  });

  it('marks patches left out of the means and those not measured', () => {
    const el = render();
    const rows = [...el.querySelectorAll('[data-testid="delta-e-row"]')];
    expect(rows[1]!.textContent).toContain('outside sRGB: not in the means');
    expect(rows[2]!.textContent).toContain('not measured');
    expect(rows[2]!.querySelectorAll('td')[4]!.textContent?.trim()).toBe('–');
  });

  it('prints the means over the in-gamut patches with their maxima', () => {
    const el = render();
    expect(el.querySelector('[data-testid="mean-before"]')!.textContent?.trim()).toBe('2.41 (2.41)');
    expect(el.querySelector('[data-testid="mean-after"]')!.textContent?.trim()).toBe('0.36 (0.36)');
    expect(el.querySelector('[data-testid="mean-cross-validated"]')!.textContent?.trim()).toBe('0.91 (0.91)');
    expect(el.querySelector('[data-testid="neutral-row"]')!.textContent).toContain('|Δa*| 0.30, |Δb*| 0.40');
    expect(formatDeltaE(Number.NaN)).toBe('–');
  });

  it('warns beside the figures when the colour fit memorises the chart, and only then', () => {
    expect(render().querySelector('[data-testid="memorised-chart"]')).toBeNull();
    TestBed.resetTestingModule();
    const el = render({ ...deltaE, memorisedChart: true });
    expect(el.querySelector('[data-testid="memorised-chart"]')!.textContent).toContain(
      'the colour fit follows this chart more than the film',
    );
  });

  it('prints dashes for a calibration kept before the cross-validated figures', () => {
    const el = render({
      ...deltaE,
      patches: deltaE.patches.map((p) => ({ ...p, crossValidated: null, deltaECrossValidated: null })),
      crossValidated: null,
      neutral: null,
      frames: [],
    });
    expect(el.querySelector('[data-testid="mean-cross-validated"]')!.textContent?.trim()).toBe('– (–)');
    expect(
      el.querySelectorAll('[data-testid="delta-e-row"]')[0]!.querySelectorAll('td')[5]!.textContent?.trim(),
    ).toBe('–');
    expect(el.querySelector('[data-testid="neutral-row"]')).toBeNull();
  });
});
