import { ChangeDetectionStrategy, Component, inject, input, output, signal, computed } from '@angular/core';
import { takeUntilDestroyed, toSignal } from '@angular/core/rxjs-interop';
import { MatButton } from '@angular/material/button';
import { MatIcon } from '@angular/material/icon';
import { MatProgressBar } from '@angular/material/progress-bar';
import { concatMap, from, mergeMap, scan, Subject } from 'rxjs';
import { bytesLabel } from './roll-labels';
import { RollsApi, type KeyedFile } from './rolls-api';
import { emptyUploads, itemPercent, reduceUploads, uploadBatch, type UploadAction } from './upload-state';

/** The scan types the server takes: TIFF and PNG, 8 or 16 bits. */
const acceptedTypes = '.tif,.tiff,.png,image/tiff,image/png';

/**
 * The scans of a roll going up: a drop zone and a picker, then one line per file with its own byte bar and the
 * server's verdict. Files go one a request, in the order picked, so frames are numbered in that order; every line
 * stays for as long as the page is open.
 */
@Component({
  selector: 'cb-upload-queue',
  imports: [MatButton, MatIcon, MatProgressBar],
  templateUrl: './upload-queue.html',
  styleUrls: ['./upload-queue.scss', './roll-card.scss', './status-chips.scss'],
  changeDetection: ChangeDetectionStrategy.OnPush,
  host: { class: 'card' },
})
export class UploadQueue {
  private readonly api = inject(RollsApi);

  /** The roll the scans go to. */
  readonly rollId = input.required<number>();
  /** Once the server kept at least one file of a request: the roll has new frames. */
  readonly framesAdded = output<void>();

  protected readonly acceptedTypes = acceptedTypes;
  protected readonly bytesLabel = bytesLabel;
  protected readonly itemPercent = itemPercent;

  private readonly actions = new Subject<UploadAction>();
  protected readonly uploads = toSignal(this.actions.pipe(scan(reduceUploads, emptyUploads)), {
    initialValue: emptyUploads,
  });
  protected readonly batch = computed(() => uploadBatch(this.uploads()));
  protected readonly dragging = signal(false);
  private readonly picked = new Subject<KeyedFile[]>();
  private nextKey = 1;

  constructor() {
    this.picked
      .pipe(
        mergeMap((files) => from(files)),
        concatMap((file) => this.api.upload(this.rollId(), [file])),
        takeUntilDestroyed(),
      )
      .subscribe((action) => {
        this.actions.next(action);
        if (action.type === 'answered' && action.result.accepted.length > 0) this.framesAdded.emit();
      });
  }

  /** Puts files on the upload list and in the queue that sends them. */
  addFiles(files: readonly File[]): void {
    const keyed = files.map((file): KeyedFile => ({ key: this.nextKey++, file }));
    this.actions.next({
      type: 'picked',
      files: keyed.map(({ key, file }) => ({ key, fileName: file.name, size: file.size })),
    });
    this.picked.next(keyed);
  }

  protected onPicked(input: HTMLInputElement): void {
    if (input.files?.length) this.addFiles([...input.files]);
    // the same file may be picked again after a fix
    input.value = '';
  }

  protected onDragOver(event: DragEvent): void {
    if (!event.dataTransfer?.types.includes('Files')) return;
    event.preventDefault();
    event.dataTransfer.dropEffect = 'copy';
    this.dragging.set(true);
  }

  protected onDrop(event: DragEvent): void {
    event.preventDefault();
    this.dragging.set(false);
    const files = event.dataTransfer?.files;
    if (files?.length) this.addFiles([...files]);
  }
}
