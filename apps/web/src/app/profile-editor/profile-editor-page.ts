import { DatePipe, DecimalPipe, TitleCasePipe } from '@angular/common';
import {
  ChangeDetectionStrategy,
  Component,
  DestroyRef,
  type ElementRef,
  computed,
  effect,
  inject,
  input,
  signal,
  untracked,
  viewChild,
} from '@angular/core';
import { ReactiveFormsModule } from '@angular/forms';
import { MatButton } from '@angular/material/button';
import { MatButtonToggle, MatButtonToggleGroup } from '@angular/material/button-toggle';
import { MatDialog } from '@angular/material/dialog';
import { MatError, MatFormField, MatHint, MatLabel, MatSuffix } from '@angular/material/form-field';
import { MatIcon } from '@angular/material/icon';
import { MatInput } from '@angular/material/input';
import { MatProgressBar } from '@angular/material/progress-bar';
import { MatSnackBar } from '@angular/material/snack-bar';
import { MatTab, MatTabGroup } from '@angular/material/tabs';
import { Router } from '@angular/router';
import type { ParameterChange, ProfileDocument, ProfileVersion } from '@clearbase/contracts';
import type { Subscription } from 'rxjs';
import { Session } from '../auth/session';
import { readProblem } from '../problem/read-problem';
import { CurveChart } from './curve-chart';
import { curvePointProblems, type CurvePointProblem } from './curve-point-problems';
import { CurveTable } from './curve-table';
import type { PreviewImage } from '../preview/preview-renderer';
import { PreviewRenderer } from '../preview/preview-renderer';
import {
  channels,
  controlAtPath,
  createProfileForm,
  readProfileForm,
  type Channel,
  type ProfileForm,
} from './profile-form';
import { ProfileVersionsApi } from './profile-versions-api';
import { PublishDialog, type PublishDialogData } from './publish-dialog';
import type { LeavesWithCare } from '../forms/unsaved-changes-guard';

type PreviewMode = 'side-by-side' | 'before' | 'after';

/** The three balance axes in the positive's terms (positive values: more red, green, blue). */
const balanceAxes = [
  { key: 'cyanRed', label: 'Cyan – red', hint: '+ more red, − more cyan' },
  { key: 'magentaGreen', label: 'Magenta – green', hint: '+ more green, − more magenta' },
  { key: 'yellowBlue', label: 'Yellow – blue', hint: '+ more blue, − more yellow' },
] as const;

const statusLabels: Record<ProfileVersion['status'], string> = {
  draft: 'Draft',
  published: 'Published',
  retired: 'Retired',
};

/**
 * Staff: one profile version's parameters in a typed form with a live before/after preview rendered in a worker.
 * Drafts can be saved; managers publish them with a changelog line. Other versions are shown read-only.
 */
@Component({
  selector: 'cb-profile-editor-page',
  imports: [
    DatePipe,
    DecimalPipe,
    TitleCasePipe,
    ReactiveFormsModule,
    MatButton,
    MatButtonToggleGroup,
    MatButtonToggle,
    MatFormField,
    MatLabel,
    MatHint,
    MatError,
    MatSuffix,
    MatInput,
    MatIcon,
    MatProgressBar,
    MatTabGroup,
    MatTab,
    CurveChart,
    CurveTable,
  ],
  providers: [PreviewRenderer],
  templateUrl: './profile-editor-page.html',
  styleUrl: './profile-editor-page.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ProfileEditorPage implements LeavesWithCare {
  /** From the route, `catalogue/versions/:versionId`. */
  readonly versionId = input.required<string>();

  private readonly api = inject(ProfileVersionsApi);
  private readonly session = inject(Session);
  private readonly dialog = inject(MatDialog);
  private readonly snackBar = inject(MatSnackBar);
  private readonly router = inject(Router);
  protected readonly preview = inject(PreviewRenderer);

  protected readonly channels = channels;
  protected readonly balanceAxes = balanceAxes;
  protected readonly statusLabels = statusLabels;

  protected readonly version = signal<ProfileVersion | null>(null);
  protected readonly form = signal<ProfileForm | null>(null);
  /** The form's raw value, refreshed on every change, for the chart, the preview and the problem lists. */
  protected readonly value = signal<ReturnType<ProfileForm['getRawValue']> | null>(null);
  protected readonly dirty = signal(false);
  protected readonly loading = signal(true);
  protected readonly saving = signal(false);
  protected readonly problem = signal<string | null>(null);
  /** Server field errors whose path names no field of the form. */
  protected readonly otherFieldErrors = signal<{ path: string; message: string }[]>([]);
  protected readonly changes = signal<ParameterChange[] | null>(null);
  protected readonly mode = signal<PreviewMode>('side-by-side');

  protected readonly isDraft = computed(() => this.version()?.status === 'draft');
  protected readonly isManager = computed(() => {
    const role = this.session.role();
    return role === 'manager' || role === 'admin';
  });
  protected readonly curves = computed(() => {
    const v = this.value();
    return {
      red: v?.curves.red.points ?? [],
      green: v?.curves.green.points ?? [],
      blue: v?.curves.blue.points ?? [],
    };
  });
  protected readonly curveProblems = computed<Record<Channel, CurvePointProblem[]>>(() => {
    const c = this.curves();
    return {
      red: curvePointProblems(c.red),
      green: curvePointProblems(c.green),
      blue: curvePointProblems(c.blue),
    };
  });
  protected readonly afterTime = computed(() => {
    const after = this.preview.after();
    return after ? Math.round(after.compileMs + after.renderMs) : null;
  });
  protected readonly megapixels = computed(() => {
    const image = this.preview.after() ?? this.preview.before();
    return image ? (image.width * image.height) / 1e6 : null;
  });

  private readonly beforeCanvas = viewChild<ElementRef<HTMLCanvasElement>>('beforeCanvas');
  private readonly afterCanvas = viewChild<ElementRef<HTMLCanvasElement>>('afterCanvas');
  private formChanges: Subscription | null = null;
  private negativeFor: number | null = null;

  constructor() {
    effect(() => {
      const id = Number(this.versionId());
      untracked(() => this.load(id));
    });
    effect(() => this.draw(this.beforeCanvas()?.nativeElement, this.preview.before()));
    effect(() => this.draw(this.afterCanvas()?.nativeElement, this.preview.after()));
    inject(DestroyRef).onDestroy(() => this.formChanges?.unsubscribe());
  }

  readonly leaveQuestion = 'This draft has unsaved changes. Leave and lose them?';

  hasUnsavedChanges(): boolean {
    return this.isDraft() && this.dirty();
  }

  protected load(id: number): void {
    this.loading.set(true);
    this.problem.set(null);
    this.api.get(id).subscribe({
      next: (version) => {
        this.loading.set(false);
        this.show(version);
        this.loadNegative(version);
      },
      error: (err: unknown) => {
        this.loading.set(false);
        this.problem.set(readProblem(err).message);
      },
    });
  }

  protected save(): void {
    const form = this.form();
    const version = this.version();
    if (!form || !version || !this.isDraft() || this.saving()) return;
    form.markAllAsTouched();
    if (form.invalid) {
      this.problem.set('Some values need fixing before the draft can be saved; they are marked below.');
      return;
    }
    this.saving.set(true);
    this.problem.set(null);
    this.otherFieldErrors.set([]);
    this.api.update(version.id, readProfileForm(form.getRawValue(), version.parameters)).subscribe({
      next: (saved) => {
        this.saving.set(false);
        this.version.set(saved);
        form.markAsPristine();
        this.dirty.set(false);
        this.preview.render('before', saved.parameters);
        this.loadChanges(saved);
        this.snackBar.open(`Version ${saved.version} saved.`, undefined, { duration: 3000 });
      },
      error: (err: unknown) => {
        this.saving.set(false);
        const problem = readProblem(err);
        const unplaced: { path: string; message: string }[] = [];
        for (const [path, message] of Object.entries(problem.fieldErrors)) {
          const control = controlAtPath(form, path);
          if (control) {
            control.setErrors({ ...control.errors, server: message });
            control.markAsTouched();
          } else unplaced.push({ path, message });
        }
        this.otherFieldErrors.set(unplaced);
        this.problem.set(problem.message);
      },
    });
  }

  /** Puts the saved parameters back into the form. */
  protected discard(): void {
    const version = this.version();
    if (version) this.show(version);
  }

  protected openPublish(): void {
    const version = this.version();
    if (!version || !this.isDraft() || this.dirty()) return;
    this.dialog
      .open<PublishDialog, PublishDialogData, ProfileVersion>(PublishDialog, {
        data: { versionId: version.id, version: version.version, stockName: version.parameters.stock.name },
        width: '520px',
        autoFocus: 'first-tabbable',
      })
      .afterClosed()
      .subscribe((published) => {
        if (!published) return;
        this.show(published);
        this.snackBar.open(`Version ${published.version} is published.`, undefined, { duration: 4000 });
      });
  }

  protected newDraft(): void {
    const version = this.version();
    if (!version) return;
    this.api.newDraft(version.profileId, version.id).subscribe({
      next: (draft) => void this.router.navigate(['/catalogue/versions', draft.id]),
      error: (err: unknown) => this.problem.set(readProblem(err).message),
    });
  }

  protected curvesOf(form: ProfileForm, c: Channel) {
    return form.controls.curves.controls[c].controls.points;
  }

  protected crosstalkCell(form: ProfileForm, r: number, k: number) {
    return form.controls.crosstalk.at(r).at(k);
  }

  /** The message for a numeric field, if it has one to show. */
  protected errorOf(control: { errors: Record<string, unknown> | null }): string | null {
    const e = control.errors;
    if (!e) return null;
    if (e['server']) return String(e['server']);
    if (e['required'] || e['finite']) return 'Enter a number.';
    if (e['above']) return String(e['above']);
    if (e['min']) return `At least ${(e['min'] as { min: number }).min}.`;
    if (e['max']) return `At most ${(e['max'] as { max: number }).max}.`;
    return 'Check this value.';
  }

  protected describe(value: unknown): string {
    return typeof value === 'number' ? String(Number(value.toFixed(4))) : JSON.stringify(value);
  }

  private show(version: ProfileVersion): void {
    this.version.set(version);
    const form = createProfileForm(version.parameters);
    if (version.status !== 'draft') form.disable({ emitEvent: false });
    this.formChanges?.unsubscribe();
    this.form.set(form);
    this.value.set(form.getRawValue());
    this.dirty.set(false);
    this.otherFieldErrors.set([]);
    this.formChanges = form.valueChanges.subscribe(() => {
      this.value.set(form.getRawValue());
      this.dirty.set(form.dirty);
      this.renderAfter();
    });
    this.loadChanges(version);
    if (this.negativeFor === version.id) {
      this.preview.render('before', version.parameters);
      this.preview.render('after', version.parameters);
    }
  }

  /** The edited parameters, when they are valid enough to render. */
  private edited(): ProfileDocument | null {
    const form = this.form();
    const version = this.version();
    if (!form || !version) return null;
    if (channels.some((c) => this.curveProblems()[c].length > 0)) return null;
    const document = readProfileForm(form.getRawValue(), version.parameters);
    const t = document.tone;
    const numbers = [
      ...document.crosstalk.flat(),
      ...Object.values(document.balance),
      t.contrast,
      t.blackPoint,
    ];
    if (!numbers.every(Number.isFinite)) return null;
    if (!(t.contrast > 0 && t.blackPoint >= 0 && t.whitePoint > t.blackPoint)) return null;
    if (!(document.saturation >= 0)) return null;
    return document;
  }

  private renderAfter(): void {
    const document = this.edited();
    if (document) this.preview.render('after', document);
  }

  private loadNegative(version: ProfileVersion): void {
    this.negativeFor = version.id;
    this.api.referenceNegative(version.id).subscribe({
      next: (negative) => {
        this.preview.load(negative, version.parameters);
        this.preview.render('before', this.version()!.parameters);
        this.renderAfter();
      },
      error: (err: unknown) => this.preview.problem.set(readProblem(err).message),
    });
  }

  private loadChanges(version: ProfileVersion): void {
    if (version.parentVersionId === null) {
      this.changes.set(null);
      return;
    }
    this.api.diff(version.parentVersionId, version.id).subscribe({
      next: (diff) => this.changes.set(diff.changes),
      error: () => this.changes.set(null),
    });
  }

  private draw(canvas: HTMLCanvasElement | undefined, image: PreviewImage | null): void {
    if (!canvas || !image) return;
    canvas.width = image.width;
    canvas.height = image.height;
    // jsdom has no 2D context; browsers always do
    const context = canvas.getContext('2d');
    context?.putImageData(
      new ImageData(image.rgba as Uint8ClampedArray<ArrayBuffer>, image.width, image.height),
      0,
      0,
    );
    // renderings drawn so far: the next one is a change of this count, even when it took the same milliseconds
    canvas.dataset['renderCount'] = String(Number(canvas.dataset['renderCount'] ?? 0) + 1);
  }
}
