import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { provideZonelessChangeDetection } from '@angular/core';
import { TestBed } from '@angular/core/testing';
import { MATERIAL_ANIMATIONS } from '@angular/material/core';
import type { Roll } from '@clearbase/contracts';
import { RollBaseForm } from './roll-base-form';
import { testFrame, testRollDetail } from './roll-testing';

async function render(roll: Roll = testRollDetail([]).roll) {
  TestBed.configureTestingModule({
    imports: [RollBaseForm],
    providers: [
      provideZonelessChangeDetection(),
      { provide: MATERIAL_ANIMATIONS, useValue: { animationsDisabled: true } },
      provideHttpClient(),
      provideHttpClientTesting(),
    ],
  });
  const backend = TestBed.inject(HttpTestingController);
  const fixture = TestBed.createComponent(RollBaseForm);
  fixture.componentRef.setInput('roll', roll);
  fixture.componentRef.setInput('frames', [testFrame(1, 'done'), testFrame(2, 'done')]);
  let saved = 0;
  fixture.componentInstance.saved.subscribe(() => saved++);
  await fixture.whenStable();
  const root = fixture.nativeElement as HTMLElement;
  const q = (id: string) => root.querySelector<HTMLElement>(`[data-testid="${id}"]`);
  return { fixture, backend, q, saved: () => saved };
}

describe('RollBaseForm', () => {
  it('saves the automatic base without a rectangle, and says it was saved', async () => {
    const { fixture, backend, q, saved } = await render();
    expect(q('roll-base-measured')!.textContent).toContain('No roll base yet');
    expect(q('base-x')).toBeNull();
    q('base-save')!.click();
    const req = backend.expectOne('/api/rolls/7/base');
    expect(req.request.body).toEqual({ mode: 'auto' });
    req.flush(testRollDetail([]).roll);
    await fixture.whenStable();
    expect(saved()).toBe(1);
  });

  it('starts from the rectangle stored on the roll, and shows the base measured', async () => {
    const stored = testRollDetail([]).roll;
    const { q } = await render({
      ...stored,
      base: {
        mode: 'region',
        frameId: 102,
        region: { x: 4, y: 8, width: 40, height: 12 },
        measured: { rgb: [0.81, 0.7, 0.62], region: { x: 4, y: 8, width: 40, height: 12 }, confidence: 0.95 },
      },
    });
    const value = (field: string) => (q(`base-${field}`) as HTMLInputElement).value;
    expect(['x', 'y', 'width', 'height'].map(value)).toEqual(['4', '8', '40', '12']);
    expect(q('roll-base-measured')!.textContent).toContain('R 0.810 · G 0.700 · B 0.620');
    expect(q('roll-base-measured')!.textContent).toContain('(confidence 95 %)');
  });

  it('sends nothing while the rectangle is incomplete, and says what each field lacks', async () => {
    const { fixture, backend, q } = await render();
    fixture.componentInstance.startFrom(101, null);
    await fixture.whenStable();
    q('base-save')!.click();
    await fixture.whenStable();
    backend.expectNone('/api/rolls/7/base');
    const errors = [...(fixture.nativeElement as HTMLElement).querySelectorAll('mat-error')].map((e) =>
      e.textContent!.trim(),
    );
    expect(errors).toEqual(['Required', 'Required']);
  });

  it('takes a frame’s rectangle and puts the server’s complaint under the fields it names', async () => {
    const { fixture, backend, q } = await render();
    fixture.componentInstance.startFrom(101, { x: 0, y: 0, width: 480, height: 20 });
    await fixture.whenStable();
    q('base-save')!.click();
    const req = backend.expectOne('/api/rolls/7/base');
    expect(req.request.body).toEqual({
      mode: 'region',
      frameId: 101,
      region: { x: 0, y: 0, width: 480, height: 20 },
    });
    req.flush(
      {
        type: 'about:blank',
        title: 'Unprocessable Content',
        status: 422,
        detail: 'The rectangle is outside the frame.',
        errors: [{ path: 'body.region.width', message: 'Wider than the frame' }],
      },
      { status: 422, statusText: 'Unprocessable Content' },
    );
    await fixture.whenStable();
    expect(q('base-error')!.textContent).toContain('The rectangle is outside the frame.');
    const errors = [...(fixture.nativeElement as HTMLElement).querySelectorAll('mat-error')].map((e) =>
      e.textContent!.trim(),
    );
    expect(errors).toEqual(['Wider than the frame']);
  });
});
