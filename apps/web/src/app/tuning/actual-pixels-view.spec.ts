import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { provideZonelessChangeDetection } from '@angular/core';
import { TestBed } from '@angular/core/testing';
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { ActualPixelsView, type ActualView } from './actual-pixels-view';
import { tuningFrame as frame } from './tuning-testing';

const centre: ActualView = { spot: { fx: 0.5, fy: 0.5 }, anchor: { x: 400, y: 300 } };

async function render(view: ActualView | null = centre) {
  TestBed.configureTestingModule({
    imports: [ActualPixelsView],
    providers: [provideZonelessChangeDetection(), provideHttpClient(), provideHttpClientTesting()],
  });
  const backend = TestBed.inject(HttpTestingController);
  const fixture = TestBed.createComponent(ActualPixelsView);
  fixture.componentRef.setInput('frame', frame(1));
  fixture.componentRef.setInput('view', view);
  await fixture.whenStable();
  const root = fixture.nativeElement as HTMLElement;
  const image = () => root.querySelector<HTMLImageElement>('[data-testid="actual-pixels-image"]');
  /** Answers the full-size JPEG and lets the image say it is 6000 × 4000 on a stage of 800 × 600. */
  const arrive = async () => {
    backend.expectOne((r) => r.url === '/api/frames/11/output').flush(new Blob([]));
    await fixture.whenStable();
    await load();
  };
  const load = async () => {
    const box = root.querySelector<HTMLElement>('[data-testid="actual-pixels-view"]')!;
    Object.defineProperty(box, 'clientWidth', { value: 800 });
    Object.defineProperty(box, 'clientHeight', { value: 600 });
    const img = image()!;
    Object.defineProperty(img, 'naturalWidth', { value: 6000 });
    Object.defineProperty(img, 'naturalHeight', { value: 4000 });
    img.dispatchEvent(new Event('load'));
    await fixture.whenStable();
  };
  return { fixture, backend, root, image, arrive, load };
}

describe('ActualPixelsView', () => {
  beforeEach(() => {
    vi.spyOn(URL, 'createObjectURL').mockImplementation(() => 'blob:full-size');
    vi.spyOn(URL, 'revokeObjectURL').mockImplementation(() => undefined);
  });

  afterEach(() => vi.restoreAllMocks());

  it('shows nothing and fetches nothing while it is off', async () => {
    const { root, backend } = await render(null);
    expect(root.querySelector('[data-testid="actual-pixels-view"]')).toBeNull();
    backend.expectNone((r) => r.url.includes('/output'));
  });

  it('puts the chosen spot of the full-size render under the anchor, one image pixel per screen pixel', async () => {
    const { image, arrive, fixture } = await render();
    await arrive();
    expect(image()!.style.transform).toBe('translate(-2600px, -1700px)');
    expect(image()!.style.width).toBe('6000px');
    expect(fixture.componentInstance.caption()).toBe('1:1 · the saved render, 6000×4000');
  });

  it('pans with a drag, kept inside the render, and remembers the spot under the centre', async () => {
    const { image, arrive, root, fixture } = await render();
    await arrive();
    const box = root.querySelector<HTMLElement>('[data-testid="actual-pixels-view"]')!;
    box.dispatchEvent(new MouseEvent('pointerdown', { clientX: 100, clientY: 100 }));
    box.dispatchEvent(new MouseEvent('pointermove', { clientX: 150, clientY: 120 }));
    box.dispatchEvent(new MouseEvent('pointerup'));
    await fixture.whenStable();
    expect(image()!.style.transform).toBe('translate(-2550px, -1680px)');
    const view = fixture.componentInstance.view()!;
    expect(view.anchor).toEqual({ x: 400, y: 300 });
    expect(view.spot.fx).toBeCloseTo(2950 / 6000, 9);
    expect(view.spot.fy).toBeCloseTo(1980 / 4000, 9);

    // far past the corner: the render's own corner stops at the stage's
    box.dispatchEvent(new MouseEvent('pointerdown', { clientX: 0, clientY: 0 }));
    box.dispatchEvent(new MouseEvent('pointermove', { clientX: 9000, clientY: 9000 }));
    await fixture.whenStable();
    expect(image()!.style.transform).toBe('translate(0px, 0px)');
  });

  it('says the render is loading until it is placed, and tells the unsaved changes apart', async () => {
    const { root, fixture, backend, image, load } = await render();
    fixture.componentRef.setInput('unsaved', true);
    await fixture.whenStable();
    expect(root.textContent).toContain('Loading the full-size render…');
    backend.expectOne((r) => r.url === '/api/frames/11/output').flush(new Blob([]));
    await fixture.whenStable();
    expect(image()!.style.visibility).toBe('hidden');
    await load();
    expect(root.textContent).not.toContain('Loading the full-size render…');
    expect(fixture.componentInstance.caption()).toContain('unsaved changes show here once saved');
  });

  it('says so in a sentence when the render cannot be fetched', async () => {
    const { fixture, backend, root } = await render();
    backend.expectOne((r) => r.url === '/api/frames/11/output').error(new ProgressEvent('error'));
    await fixture.whenStable();
    expect(root.querySelector('[data-testid="actual-pixels-note"]')!.textContent).toBe(
      'The server cannot be reached. Check the connection and try again.',
    );
  });
});
