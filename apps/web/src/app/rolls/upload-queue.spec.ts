import { HttpEventType, provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { provideZonelessChangeDetection } from '@angular/core';
import { TestBed } from '@angular/core/testing';
import { MATERIAL_ANIMATIONS } from '@angular/material/core';
import { UploadQueue } from './upload-queue';

async function render() {
  TestBed.configureTestingModule({
    imports: [UploadQueue],
    providers: [
      provideZonelessChangeDetection(),
      { provide: MATERIAL_ANIMATIONS, useValue: { animationsDisabled: true } },
      provideHttpClient(),
      provideHttpClientTesting(),
    ],
  });
  const backend = TestBed.inject(HttpTestingController);
  const fixture = TestBed.createComponent(UploadQueue);
  fixture.componentRef.setInput('rollId', 7);
  let added = 0;
  fixture.componentInstance.framesAdded.subscribe(() => added++);
  await fixture.whenStable();
  const root = fixture.nativeElement as HTMLElement;
  const line = (key: number) => root.querySelector(`[data-testid="upload-${key}"]`)!;
  const stateOf = (key: number) =>
    line(key).querySelector('[data-testid="upload-state"]')!.textContent!.trim();
  return { fixture, backend, root, line, stateOf, added: () => added };
}

describe('UploadQueue', () => {
  it('sends each picked file on its own and shows the server’s reason beside the refused one', async () => {
    const { fixture, backend, root, line, stateOf, added } = await render();
    fixture.componentInstance.addFiles([
      new File(['I am text'], 'notes.tif'),
      new File([new Uint8Array(2000)], 'frame-01.tif'),
    ]);
    await fixture.whenStable();
    expect(stateOf(2)).toBe('Queued');

    const first = backend.expectOne('/api/rolls/7/frames');
    expect((first.request.body as FormData).getAll('files').map((f) => (f as File).name)).toEqual([
      'notes.tif',
    ]);
    first.event({ type: HttpEventType.UploadProgress, loaded: 9, total: 9 });
    first.flush(
      {
        type: 'about:blank',
        title: 'Unprocessable Content',
        status: 422,
        detail: 'None of the 1 files was kept: notes.tif: The file is not a TIFF or PNG image.',
        errors: [{ path: 'files.notes.tif', message: 'notes.tif: The file is not a TIFF or PNG image.' }],
      },
      { status: 422, statusText: 'Unprocessable Content' },
    );
    await fixture.whenStable();
    expect(added()).toBe(0);

    const second = backend.expectOne('/api/rolls/7/frames');
    second.event({ type: HttpEventType.UploadProgress, loaded: 1100, total: 2200 });
    await fixture.whenStable();
    expect(stateOf(2)).toBe('Sending 50 %');
    second.flush({
      accepted: [{ fileName: 'frame-01.tif', frameId: 101, index: 1, duplicate: false, warnings: [] }],
      rejected: [],
    });
    await fixture.whenStable();

    expect(line(1).querySelector('[data-testid="upload-reason"]')!.textContent!.trim()).toBe(
      'The file is not a TIFF or PNG image.',
    );
    expect(line(2).querySelector('[data-testid="upload-reason"]')).toBeNull();
    expect(stateOf(2)).toBe('Frame 1');
    expect(root.querySelector('[data-testid="upload-batch-counts"]')!.textContent!.trim()).toBe(
      '1 kept · 1 refused',
    );
    expect(added()).toBe(1);
    backend.verify();
  });

  it('takes files dropped on the zone, tinting it while they are held over it', async () => {
    const { fixture, backend, root } = await render();
    const zone = root.querySelector('[data-testid="upload-drop-zone"]') as HTMLElement;
    const files = [new File([new Uint8Array(10)], 'frame-02.tif')];
    const dataTransfer = { types: ['Files'], files, dropEffect: 'none' };
    const over = Object.assign(new Event('dragover', { cancelable: true }), { dataTransfer });
    zone.dispatchEvent(over);
    await fixture.whenStable();
    expect(over.defaultPrevented).toBe(true);
    expect(zone.classList).toContain('receiving');
    zone.dispatchEvent(Object.assign(new Event('drop', { cancelable: true }), { dataTransfer }));
    await fixture.whenStable();
    expect(zone.classList).not.toContain('receiving');
    expect(root.querySelector('[data-testid="upload-name"]')!.textContent).toBe('frame-02.tif');
    backend.expectOne('/api/rolls/7/frames');
  });

  it('lets a dragged text pass over the zone without taking it', async () => {
    const { fixture, root } = await render();
    const zone = root.querySelector('[data-testid="upload-drop-zone"]') as HTMLElement;
    const over = Object.assign(new Event('dragover', { cancelable: true }), {
      dataTransfer: { types: ['text/plain'], files: [] },
    });
    zone.dispatchEvent(over);
    await fixture.whenStable();
    expect(over.defaultPrevented).toBe(false);
    expect(zone.classList).not.toContain('receiving');
  });
});
