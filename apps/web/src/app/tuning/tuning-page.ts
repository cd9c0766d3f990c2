import {
  ChangeDetectionStrategy,
  Component,
  computed,
  effect,
  inject,
  input,
  signal,
  untracked,
  viewChild,
} from '@angular/core';
import { MatButton, MatIconButton } from '@angular/material/button';
import { MatIcon } from '@angular/material/icon';
import { MatProgressBar } from '@angular/material/progress-bar';
import { RouterLink } from '@angular/router';
import { holdUnloadWithUnsavedChanges, type LeavesWithCare } from '../forms/unsaved-changes-guard';
import { PreviewRenderer } from '../preview/preview-renderer';
import { FrameStrip } from './frame-strip';
import { FrameViewer } from './frame-viewer';
import { TuningControls } from './tuning-controls';
import { tuningKeys, type TuningKeyAction } from './tuning-keys';
import { TuningSession } from './tuning-session';

/**
 * Staff: the tuning screen of one roll. The selected frame's working negative renders live in a worker at the
 * server's levels, before (profile only) and after (with the roll's and the frame's adjustments); casts in whole
 * printer points, exposure in sixth stops, contrast; a neutral picker; undo and redo; saving renders on the server.
 * The page holds the session they share, the header, the keys and their help.
 */
@Component({
  selector: 'cb-tuning-page',
  imports: [
    RouterLink,
    MatButton,
    MatIconButton,
    MatIcon,
    MatProgressBar,
    FrameViewer,
    TuningControls,
    FrameStrip,
  ],
  providers: [PreviewRenderer, TuningSession],
  templateUrl: './tuning-page.html',
  styleUrl: './tuning-page.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
  host: {
    '(document:keydown)': 'onKey($event)',
    '(window:beforeunload)': 'holdUnload($event)',
  },
})
export class TuningPage implements LeavesWithCare {
  /** The roll id, from the route. */
  readonly id = input.required<string>();

  protected readonly session = inject(TuningSession);
  protected readonly keys = tuningKeys.help;
  protected readonly helpOpen = signal(false);
  private readonly viewer = viewChild(FrameViewer);
  /** The header's icon buttons: undo, redo and the keys' help. */
  protected readonly tools = computed(() => [
    {
      icon: 'undo',
      label: 'Undo',
      title: 'Undo (Ctrl Z)',
      off: !this.session.canUndo(),
      run: () => this.session.undo(),
    },
    {
      icon: 'redo',
      label: 'Redo',
      title: 'Redo (Ctrl Shift Z)',
      off: !this.session.canRedo(),
      run: () => this.session.redo(),
    },
    {
      icon: 'keyboard',
      label: 'Keyboard keys',
      title: 'Keys (?)',
      off: false,
      run: () => this.helpOpen.set(true),
    },
  ]);

  readonly leaveQuestion = 'This roll has unsaved tuning. Leave and lose it?';

  constructor() {
    effect(() => {
      const rollId = Number(this.id());
      untracked(() => this.session.open(rollId));
    });
  }

  hasUnsavedChanges(): boolean {
    return this.session.unsaved();
  }

  protected holdUnload(event: BeforeUnloadEvent): void {
    holdUnloadWithUnsavedChanges(this, event);
  }

  protected onKey(event: KeyboardEvent): void {
    const action = tuningKeys.actionOf(event);
    if (!action) return;
    event.preventDefault();
    this.run(action);
  }

  private run(action: TuningKeyAction): void {
    const viewer = this.viewer();
    switch (action) {
      case 'previous-frame':
        return this.session.step(-1);
      case 'next-frame':
        return this.session.step(1);
      case 'undo':
        return this.session.undo();
      case 'redo':
        return this.session.redo();
      case 'approve':
        return this.session.review('approved');
      case 'exclude':
        return this.session.review('excluded');
      case 'save':
        return this.session.save();
      case 'help':
        return this.helpOpen.update((v) => !v);
      case 'escape':
        return this.helpOpen() ? this.helpOpen.set(false) : viewer?.leaveActual();
      case 'before-after':
        return viewer?.toggleBefore();
      case 'next-view':
        return viewer?.nextView();
      case 'neutral-picker':
        return viewer?.togglePicker();
      case 'base-region':
        return viewer?.toggleBase();
      case 'fit':
        return viewer?.fit();
      case 'zoom-in':
        // a quarter more or a fifth less per step: our choice
        return viewer?.zoomBy(1.25);
      case 'zoom-out':
        return viewer?.zoomBy(0.8);
      case 'actual-pixels':
        return viewer?.toggleActual();
    }
  }
}
