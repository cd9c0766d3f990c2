import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { provideZonelessChangeDetection } from '@angular/core';
import { TestBed } from '@angular/core/testing';
import { MATERIAL_ANIMATIONS } from '@angular/material/core';
import { ActivatedRoute, convertToParamMap, provideRouter } from '@angular/router';
import { testStocks } from '../catalogue/catalogue-testing';
import type { CalibrationRollOnFile } from './calibration-api';
import { CalibrationPage, stopsFromFileName } from './calibration-page';

describe('stops from a grey frame’s file name', () => {
  it('reads a signed number before the extension', () => {
    expect(stopsFromFileName('grey+1.5.tif')).toBe(1.5);
    expect(stopsFromFileName('grey_-2.tif')).toBe(-2);
    expect(stopsFromFileName('bracket +0.33 stops.png')).toBe(0.33);
  });

  it('leaves the stops empty when the name carries none', () => {
    expect(stopsFromFileName('grey-03.tif')).toBeNull();
    expect(stopsFromFileName('grey03.tif')).toBeNull();
  });
});

const rollOnFile: CalibrationRollOnFile = {
  id: 1,
  stockId: 3,
  stockName: 'Bramble Mono 100',
  scannerId: null,
  title: 'Trial roll 1',
  note: 'Whole stops.',
  frames: [
    { n: 1, role: 'bracket', fileId: 11, fileName: 'a.tif', width: 60, height: 40, stops: -1 },
    { n: 2, role: 'bracket', fileId: 12, fileName: 'b.tif', width: 60, height: 40, stops: 0 },
    { n: 3, role: 'bracket', fileId: 13, fileName: 'c.tif', width: 60, height: 40, stops: 1 },
    { n: 4, role: 'chart', fileId: 14, fileName: 'chart.tif', width: 48, height: 40, stops: null },
    { n: 5, role: 'leader', fileId: 15, fileName: 'leader.tif', width: 60, height: 40, stops: null },
  ],
  createdAt: '2026-11-01T09:00:00.000Z',
};

async function render(query: Record<string, string> = {}) {
  TestBed.configureTestingModule({
    imports: [CalibrationPage],
    providers: [
      provideZonelessChangeDetection(),
      { provide: MATERIAL_ANIMATIONS, useValue: { animationsDisabled: true } },
      provideHttpClient(),
      provideHttpClientTesting(),
      provideRouter([]),
      { provide: ActivatedRoute, useValue: { snapshot: { queryParamMap: convertToParamMap(query) } } },
    ],
  });
  const backend = TestBed.inject(HttpTestingController);
  const fixture = TestBed.createComponent(CalibrationPage);
  await fixture.whenStable();
  backend.expectOne('/api/stocks').flush({ stocks: testStocks });
  backend.expectOne('/api/calibrations').flush({ calibrations: [] });
  backend.expectOne('/api/calibration-rolls').flush({ rolls: [rollOnFile] });
  await fixture.whenStable();
  return { fixture, backend, el: fixture.nativeElement as HTMLElement };
}

describe('CalibrationPage', () => {
  beforeEach(() => {
    // the previews are object URLs of the server's JPEGs; jsdom has no object URLs
    URL.createObjectURL = () => 'blob:preview';
  });

  it('picks the stock named in the address', async () => {
    const { fixture } = await render({ stock: '2' });
    const page = fixture.componentInstance as unknown as { form: { value: { stockId: number | null } } };
    expect(page.form.value.stockId).toBe(2);
  });

  it('loads a roll on file: its stock, the grey frames with their stops, the chart and the leader', async () => {
    const { backend, fixture, el } = await render();
    expect(el.querySelector('[data-testid="roll-on-file-1"]')!.textContent).toContain(
      '3 grey frames, the chart and a leader',
    );
    (el.querySelector('[data-testid="load-roll-1"]') as HTMLButtonElement).click();
    for (const f of rollOnFile.frames)
      backend
        .expectOne(`/api/calibration-rolls/1/frames/${f.n}`)
        .flush(new Blob([new Uint8Array(8)], { type: 'image/tiff' }));
    await fixture.whenStable();
    const previews = backend.match('/api/calibrations/frame-preview');
    expect(previews.map((p) => (p.request.body as FormData).get('file') as File).map((f) => f.name)).toEqual([
      'a.tif',
      'chart.tif',
    ]);
    for (const p of previews)
      p.flush(new Blob([new Uint8Array(4)], { type: 'image/jpeg' }), {
        headers: { 'X-Frame-Width': '60', 'X-Frame-Height': '40' },
      });
    await fixture.whenStable();

    const stops = [...el.querySelectorAll<HTMLInputElement>('[data-testid^="stops-"]')].map((i) => i.value);
    expect(stops).toEqual(['-1', '0', '1']);
    expect(el.querySelector('[data-testid="bracket-table"]')!.textContent).toContain('c.tif');
    expect(el.querySelector('[data-testid="chart-marker"]')).not.toBeNull();
    expect(el.textContent).toContain('leader.tif');
    const page = fixture.componentInstance as unknown as { form: { value: { stockId: number | null } } };
    expect(page.form.value.stockId).toBe(3);
    expect(el.querySelector('[data-testid="grey-region"]')!.textContent).toContain('15');
    backend.verify();
  });
});
