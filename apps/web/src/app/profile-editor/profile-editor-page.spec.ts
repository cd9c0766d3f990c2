import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { provideZonelessChangeDetection } from '@angular/core';
import { type ComponentFixture, TestBed } from '@angular/core/testing';
import { MATERIAL_ANIMATIONS } from '@angular/material/core';
import { provideRouter } from '@angular/router';
import type { ProfileVersion, User } from '@clearbase/contracts';
import { Session } from '../auth/session';
import type { PreviewReply, PreviewRequest } from '../preview/preview-messages';
import { createPreviewHandler } from '../preview/preview-handler';
import { PREVIEW_FRAME_SCHEDULER, PREVIEW_PORT_FACTORY, type PreviewPort } from '../preview/preview-renderer';
import { ProfileEditorPage } from './profile-editor-page';

const draft: ProfileVersion = {
  id: 12,
  profileId: 3,
  version: 2,
  status: 'draft',
  parentVersionId: 11,
  changelog: null,
  createdAt: '2026-11-30T10:00:00.000Z',
  createdBy: 2,
  updatedAt: '2026-11-30T10:00:00.000Z',
  publishedAt: null,
  publishedBy: null,
  retiredAt: null,
  parameters: {
    schemaVersion: 1,
    id: 'demo-tealine-200',
    version: 2,
    stock: { name: 'Tealine 200', process: 'C-41', base: 'clear', iso: 200 },
    curves: {
      red: {
        points: [
          { logExposure: -3, density: 0 },
          { logExposure: 0, density: 1.8 },
        ],
      },
      green: {
        points: [
          { logExposure: -3, density: 0 },
          { logExposure: 0, density: 1.86 },
        ],
      },
      blue: {
        points: [
          { logExposure: -3, density: 0 },
          { logExposure: 0, density: 1.92 },
        ],
      },
    },
    crosstalk: [
      [1, 0, 0],
      [0, 1, 0],
      [0, 0, 1],
    ],
    balance: { cyanRed: 0, magentaGreen: -1, yellowBlue: -2 },
    tone: { contrast: 1.1, blackPoint: 0.01, whitePoint: 1 },
    saturation: 1,
  },
};

/** A port that runs the worker's handler in place and answers on a microtask, as a worker would, later. */
function inPlacePort(): PreviewPort {
  const handle = createPreviewHandler();
  const port: PreviewPort = {
    onmessage: null,
    terminate: () => undefined,
    postMessage(message: PreviewRequest) {
      const { reply } = handle(message);
      queueMicrotask(() => port.onmessage?.({ data: reply } as MessageEvent<PreviewReply>));
    },
  };
  return port;
}

interface Rendered {
  fixture: ComponentFixture<ProfileEditorPage>;
  backend: HttpTestingController;
  el: HTMLElement;
}

async function render(role: User['role'], version: ProfileVersion = draft): Promise<Rendered> {
  TestBed.configureTestingModule({
    imports: [ProfileEditorPage],
    providers: [
      provideZonelessChangeDetection(),
      { provide: MATERIAL_ANIMATIONS, useValue: { animationsDisabled: true } },
      provideHttpClient(),
      provideHttpClientTesting(),
      provideRouter([]),
      { provide: PREVIEW_PORT_FACTORY, useValue: inPlacePort },
      { provide: PREVIEW_FRAME_SCHEDULER, useValue: (run: () => void) => run() },
    ],
  });
  const backend = TestBed.inject(HttpTestingController);
  TestBed.inject(Session).load().subscribe();
  backend
    .expectOne('/api/auth/me')
    .flush({ id: 2, email: `${role}@lab.test`, name: 'Morwen Tesk', role } satisfies Partial<User>);
  const fixture = TestBed.createComponent(ProfileEditorPage);
  fixture.componentRef.setInput('versionId', String(version.id));
  fixture.detectChanges();
  backend.expectOne(`/api/profile-versions/${version.id}`).flush({ version });
  await fixture.whenStable();
  if (version.parentVersionId)
    backend.expectOne(`/api/profile-versions/${version.parentVersionId}/diff/${version.id}`).flush({
      from: version.parentVersionId,
      to: version.id,
      changes: [{ path: 'balance.magentaGreen', before: 0, after: -1 }],
    });
  const width = 8,
    height = 4;
  // a mid-grey negative: every count at 20 % transmission of a base at 90 %
  backend
    .expectOne(`/api/profile-versions/${version.id}/reference-negative`)
    .flush(new Uint16Array(width * height * 3).fill(Math.round(0.2 * 65535)).buffer, {
      headers: {
        'X-Negative-Width': String(width),
        'X-Negative-Height': String(height),
        'X-Film-Base': '0.9,0.9,0.9',
      },
    });
  await fixture.whenStable();
  await new Promise((r) => setTimeout(r, 0));
  await fixture.whenStable();
  return { fixture, backend, el: fixture.nativeElement as HTMLElement };
}

const byTestId = (el: HTMLElement, id: string) => el.querySelector<HTMLElement>(`[data-testid="${id}"]`);

function type(input: HTMLElement | null, value: string): void {
  const field = input as HTMLInputElement;
  field.value = value;
  field.dispatchEvent(new Event('input'));
}

describe('the profile editor page', () => {
  // jsdom draws nothing: the canvas has no 2D context there, and says so loudly unless asked quietly
  beforeEach(() => vi.spyOn(HTMLCanvasElement.prototype, 'getContext').mockReturnValue(null));
  afterEach(() => {
    TestBed.inject(HttpTestingController).verify();
    vi.restoreAllMocks();
  });

  it('shows a manager the draft with a publish button, its changes and the rendered preview time', async () => {
    const { el } = await render('manager');
    expect(byTestId(el, 'editor-title')?.textContent).toContain('Tealine 200 · version 2');
    expect(byTestId(el, 'editor-publish')).not.toBeNull();
    expect(byTestId(el, 'changes')?.textContent).toContain('balance.magentaGreen');
    expect(byTestId(el, 'preview-time')?.textContent).toMatch(/rendered in \d+ ms/);
  });

  it('counts each rendering drawn on the edited preview, so the next one shows even at the same timing', async () => {
    const { fixture, el } = await render('operator');
    const drawn = () => Number(byTestId(el, 'preview-after')?.dataset['renderCount']);
    expect(drawn()).toBe(1);
    type(byTestId(el, 'balance-magentaGreen'), '-5');
    await fixture.whenStable();
    await expect.poll(drawn).toBe(2);
    expect(byTestId(el, 'preview-before')?.dataset['renderCount']).toBe('1');
  });

  it('shows an operator no publish button', async () => {
    const { el } = await render('operator');
    expect(byTestId(el, 'editor-save')).not.toBeNull();
    expect(byTestId(el, 'editor-publish')).toBeNull();
  });

  it('saves the edited balance with PATCH and shows a server field error next to its field', async () => {
    const { fixture, backend, el } = await render('operator');
    type(byTestId(el, 'balance-magentaGreen'), '-5');
    await fixture.whenStable();
    byTestId(el, 'editor-save')!.click();
    const patch = backend.expectOne({ method: 'PATCH', url: '/api/profile-versions/12' });
    expect(patch.request.body.parameters.balance).toEqual({ cyanRed: 0, magentaGreen: -5, yellowBlue: -2 });
    patch.flush(
      {
        type: 'about:blank',
        title: 'Bad Request',
        status: 400,
        detail: 'Some fields are missing or invalid.',
        errors: [{ path: 'body.parameters.balance.magentaGreen', message: 'must be a finite number' }],
      },
      { status: 400, statusText: 'Bad Request', headers: { 'Content-Type': 'application/problem+json' } },
    );
    await fixture.whenStable();
    expect(byTestId(el, 'editor-error')?.textContent).toContain('Some fields are missing or invalid.');
    expect(el.textContent).toContain('must be a finite number');
  });

  it('shows a published version read-only and offers a new draft instead', async () => {
    const published: ProfileVersion = { ...draft, status: 'published', changelog: 'First house profile' };
    const { el } = await render('manager', published);
    expect(byTestId(el, 'editor-read-only')).not.toBeNull();
    expect(byTestId(el, 'editor-new-draft')).not.toBeNull();
    expect(byTestId(el, 'editor-save')).toBeNull();
    expect((byTestId(el, 'balance-magentaGreen') as HTMLInputElement).disabled).toBe(true);
  });
});
