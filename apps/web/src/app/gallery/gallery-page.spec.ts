import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { provideZonelessChangeDetection } from '@angular/core';
import { type ComponentFixture, TestBed } from '@angular/core/testing';
import { provideRouter } from '@angular/router';
import type { GalleryFrame } from '@clearbase/contracts';
import { BrowserLocation } from '../prices/browser-location';
import { GalleryPage } from './gallery-page';

const frame = (id: number, rollNumber: number, index: number): GalleryFrame => ({
  id,
  rollId: 10 + rollNumber,
  rollNumber,
  index,
  fileName: `scan-${index}.tif`,
  width: 1200,
  height: 800,
  thumbnailUrl: `/api/frames/${id}/thumbnail`,
  previewUrl: `/api/frames/${id}/preview`,
  downloads: [
    { format: 'jpeg', url: `/api/frames/${id}/output?format=jpeg` },
    { format: 'tiff16', url: `/api/frames/${id}/output?format=tiff16` },
  ],
});

const released = { fullSize: true, reason: null };
const settled = { currency: 'EUR', priceMinor: 2000, paidMinor: 2000, dueMinor: 0 };

async function render(
  frames: GalleryFrame[] | { status: number; body: object },
  held?: { reason: string; dueMinor: number },
) {
  const assigned: string[] = [];
  TestBed.configureTestingModule({
    imports: [GalleryPage],
    providers: [
      provideZonelessChangeDetection(),
      provideHttpClient(),
      provideHttpClientTesting(),
      provideRouter([]),
      { provide: BrowserLocation, useValue: { assign: (url: string) => assigned.push(url) } },
    ],
  });
  const backend = TestBed.inject(HttpTestingController);
  const fixture = TestBed.createComponent(GalleryPage);
  fixture.componentRef.setInput('id', '7');
  await fixture.whenStable();
  const req = backend.expectOne('/api/orders/7/gallery');
  if (Array.isArray(frames)) {
    req.flush({
      orderId: 7,
      frames,
      release: held ? { fullSize: false, reason: held.reason } : released,
      balance: held ? { ...settled, paidMinor: 2000 - held.dueMinor, dueMinor: held.dueMinor } : settled,
    });
  } else req.flush(frames.body, { status: frames.status, statusText: 'Error' });
  await fixture.whenStable();
  return { fixture, backend, assigned };
}

const q = (f: ComponentFixture<GalleryPage>, id: string) =>
  (f.nativeElement as HTMLElement).querySelector<HTMLElement>(`[data-testid="${id}"]`);
const key = async (f: ComponentFixture<GalleryPage>, k: string) => {
  document.dispatchEvent(new KeyboardEvent('keydown', { key: k }));
  await f.whenStable();
};

describe('GalleryPage', () => {
  afterEach(() => TestBed.inject(HttpTestingController).verify());

  it('shows the thumbnails under their rolls', async () => {
    const { fixture } = await render([frame(1, 1, 1), frame(2, 1, 2), frame(3, 2, 1)]);
    const titles = [...(fixture.nativeElement as HTMLElement).querySelectorAll('h2.roll-title')].map((h) =>
      h.textContent?.trim(),
    );
    expect(titles).toEqual(['Roll 1', 'Roll 2']);
    expect(q(fixture, 'gallery-thumb-3')?.querySelector('img')?.getAttribute('src')).toBe(
      '/api/frames/3/thumbnail',
    );
    expect(q(fixture, 'gallery-download-all')?.textContent).toContain('Download all (3)');
  });

  it('opens a frame full size, steps with the arrow keys around the ends, and closes with Escape', async () => {
    const { fixture } = await render([frame(1, 1, 1), frame(2, 1, 2), frame(3, 2, 1)]);
    q(fixture, 'gallery-thumb-2')!.click();
    await fixture.whenStable();
    expect(q(fixture, 'gallery-lightbox-image')?.getAttribute('src')).toBe('/api/frames/2/preview');

    await key(fixture, 'ArrowRight');
    expect(q(fixture, 'gallery-lightbox-caption')?.textContent).toContain('Roll 2 · frame 1');
    await key(fixture, 'ArrowRight');
    expect(q(fixture, 'gallery-lightbox-image')?.getAttribute('src')).toBe('/api/frames/1/preview');
    await key(fixture, 'ArrowLeft');
    expect(q(fixture, 'gallery-lightbox-image')?.getAttribute('src')).toBe('/api/frames/3/preview');

    await key(fixture, 'Escape');
    expect(q(fixture, 'gallery-lightbox')).toBeNull();
  });

  it('offers each of a frame’s files to download from the full-size view', async () => {
    const { fixture } = await render([frame(4, 1, 1)]);
    q(fixture, 'gallery-thumb-4')!.click();
    await fixture.whenStable();
    expect(q(fixture, 'gallery-download-jpeg')?.getAttribute('href')).toBe(
      '/api/frames/4/output?format=jpeg',
    );
    expect(q(fixture, 'gallery-download-tiff16')?.hasAttribute('download')).toBe(true);
  });

  it('downloads the whole order through a fresh signed link', async () => {
    const { fixture, backend, assigned } = await render([frame(1, 1, 1)]);
    q(fixture, 'gallery-download-all')!.click();
    backend
      .expectOne({ method: 'POST', url: '/api/orders/7/download-links' })
      .flush({ url: 'http://lab.test/api/downloads/tok', expiresAt: '2026-03-09T09:00:00.000Z' });
    await fixture.whenStable();
    expect(assigned).toEqual(['http://lab.test/api/downloads/tok']);
  });

  it('says so when nothing is finished yet, and shows the server’s reason when the order is not found', async () => {
    const empty = await render([]);
    expect(q(empty.fixture, 'gallery-empty')).not.toBeNull();
    expect(q(empty.fixture, 'gallery-download-all')).toBeNull();
    TestBed.resetTestingModule();
    const missing = await render({
      status: 404,
      body: { type: 'about:blank', title: 'Not Found', status: 404, detail: 'No order with id 7.' },
    });
    expect(q(missing.fixture, 'gallery-problem')?.textContent).toContain('No order with id 7.');
  });

  it('says why downloads are held back and what is left to pay, and offers only the thumbnails', async () => {
    const thumbOnly = { ...frame(1, 1, 1), previewUrl: null, downloads: [] };
    const reason = 'Order 7 has €20.00 left to pay; its full-size scans come once it is paid in full.';
    const { fixture } = await render([thumbOnly], { reason, dueMinor: 2000 });
    expect(q(fixture, 'gallery-held-back')?.textContent).toContain(reason);
    expect(q(fixture, 'gallery-due')?.textContent).toContain('Left to pay: €20.00');
    expect(q(fixture, 'gallery-pay-link')?.getAttribute('href')).toBe('/orders/7');
    expect(q(fixture, 'gallery-download-all')).toBeNull();
    q(fixture, 'gallery-thumb-1')!.click();
    await fixture.whenStable();
    expect(q(fixture, 'gallery-lightbox-image')?.getAttribute('src')).toBe('/api/frames/1/thumbnail');
    expect(q(fixture, 'gallery-download-jpeg')).toBeNull();
  });
});
