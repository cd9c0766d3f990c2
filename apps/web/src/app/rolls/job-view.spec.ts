import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { provideZonelessChangeDetection } from '@angular/core';
import { TestBed } from '@angular/core/testing';
import { MATERIAL_ANIMATIONS } from '@angular/material/core';
import type { Job } from '@clearbase/contracts';
import { JobView } from './job-view';
import { testJob } from './roll-testing';

async function render(job: Job | null, frameCount = 2, doneCount = 0) {
  TestBed.configureTestingModule({
    imports: [JobView],
    providers: [
      provideZonelessChangeDetection(),
      { provide: MATERIAL_ANIMATIONS, useValue: { animationsDisabled: true } },
      provideHttpClient(),
      provideHttpClientTesting(),
    ],
  });
  const backend = TestBed.inject(HttpTestingController);
  const fixture = TestBed.createComponent(JobView);
  fixture.componentRef.setInput('rollId', 7);
  fixture.componentRef.setInput('job', job);
  fixture.componentRef.setInput('frameCount', frameCount);
  fixture.componentRef.setInput('doneCount', doneCount);
  const started: Job[] = [];
  const cancelled: Job[] = [];
  fixture.componentInstance.started.subscribe((j) => started.push(j));
  fixture.componentInstance.cancelled.subscribe((j) => cancelled.push(j));
  await fixture.whenStable();
  const root = fixture.nativeElement as HTMLElement;
  const q = (id: string) => root.querySelector<HTMLElement>(`[data-testid="${id}"]`);
  return { fixture, backend, q, started, cancelled };
}

describe('JobView', () => {
  it('starts the inversion with the roll’s levels when asked, and says it started', async () => {
    const { fixture, backend, q, started } = await render(null);
    expect(q('job-state')).toBeNull();
    (q('levels-roll')!.querySelector('button') as HTMLButtonElement).click();
    await fixture.whenStable();
    q('invert-roll')!.click();
    const req = backend.expectOne('/api/rolls/7/invert');
    expect(req.request.body).toEqual({ frames: 'pending', levels: 'roll' });
    req.flush(testJob(4, 'queued'), { status: 202, statusText: 'Accepted' });
    await fixture.whenStable();
    expect(started.map((j) => j.id)).toEqual([4]);
    backend.verify();
  });

  it('starts the inversion fixed at the metered exposure when that is chosen, in words that say so', async () => {
    const { fixture, backend, q } = await render(null);
    const metered = q('levels-metered')!;
    expect(metered.textContent!.trim()).toBe('Fixed at the metered exposure');
    (metered.querySelector('button') as HTMLButtonElement).click();
    await fixture.whenStable();
    q('invert-roll')!.click();
    const req = backend.expectOne('/api/rolls/7/invert');
    expect(req.request.body).toEqual({ frames: 'pending', levels: 'metered' });
    req.flush(testJob(5, 'queued'), { status: 202, statusText: 'Accepted' });
    backend.verify();
  });

  it('shows a running job’s progress, offers to cancel it, and tells the job as it is after', async () => {
    const running = { ...testJob(4, 'running'), progress: { done: 1, failed: 1, total: 4 } };
    const { fixture, backend, q, cancelled } = await render(running, 4, 1);
    expect(q('job-state')!.textContent!.trim()).toBe('Inverting');
    expect(q('job-progress')!.textContent!.replace(/\s+/g, ' ').trim()).toBe('1 of 4 done · 1 failed');
    expect(q('invert-roll')).toBeNull();
    expect(q('invert-levels')).toBeNull();
    q('job-cancel')!.click();
    backend
      .expectOne('/api/jobs/4/cancel')
      .flush(testJob(4, 'cancelled'), { status: 202, statusText: 'Accepted' });
    await fixture.whenStable();
    expect(cancelled.map((j) => j.state)).toEqual(['cancelled']);
  });

  it('offers to invert only the frames still to do, and every frame again once some are done', async () => {
    const none = await render(testJob(4, 'done'), 2, 2);
    expect((none.q('invert-roll') as HTMLButtonElement).disabled).toBe(true);
    expect((none.q('invert-all') as HTMLButtonElement).disabled).toBe(false);
    expect(none.q('job-state')!.textContent!.trim()).toBe('Finished');
  });
});
