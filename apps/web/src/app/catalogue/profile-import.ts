import { ChangeDetectionStrategy, Component, inject, output, signal } from '@angular/core';
import { MatButton } from '@angular/material/button';
import { MatIcon } from '@angular/material/icon';
import type { ImportProfileResponse } from '@clearbase/contracts';
import { readProblem } from '../problem/read-problem';
import { CatalogueApi } from './catalogue-api';

/** One complaint of the server about an imported document, at its path inside the document. */
interface ImportError {
  path: string;
  message: string;
}

/**
 * Operators: sends a profile document file to the server, which makes a new profile or a new draft (never
 * overwriting), and lists each schema error with its path when the document does not fit.
 */
@Component({
  selector: 'cb-profile-import',
  imports: [MatButton, MatIcon],
  template: `
    <input
      #file
      type="file"
      accept="application/json,.json"
      class="cdk-visually-hidden"
      (change)="send(file)"
      data-testid="profile-import-file"
    />
    <button
      mat-stroked-button
      type="button"
      (click)="file.click()"
      [disabled]="busy()"
      data-testid="profile-import"
    >
      <mat-icon>upload_file</mat-icon>
      Import a profile document
    </button>
    @if (problem(); as message) {
      <div class="cb-problem" role="alert" data-testid="profile-import-error">
        <div>
          {{ message }}
          @if (errors().length) {
            <ul class="errors">
              @for (e of errors(); track $index) {
                <li data-testid="profile-import-path-error">
                  <code>{{ e.path || '(document)' }}</code> {{ e.message }}
                </li>
              }
            </ul>
          }
        </div>
      </div>
    }
  `,
  styles: `
    :host {
      display: block;
    }
    .cb-problem {
      margin-top: 12px;
    }
    .errors {
      margin: 8px 0 0;
      padding-left: 20px;
    }
    code {
      font-family: ui-monospace, 'DejaVu Sans Mono', monospace;
      margin-right: 4px;
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ProfileImport {
  private readonly api = inject(CatalogueApi);

  /** What the import made, once the server accepted the document. */
  readonly imported = output<ImportProfileResponse>();

  protected readonly busy = signal(false);
  protected readonly problem = signal<string | null>(null);
  protected readonly errors = signal<ImportError[]>([]);

  protected send(input: HTMLInputElement): void {
    const file = input.files?.[0];
    if (!file) return;
    this.busy.set(true);
    this.problem.set(null);
    this.errors.set([]);
    this.api.importProfile(file).subscribe({
      next: (made) => {
        this.busy.set(false);
        input.value = '';
        this.imported.emit(made);
      },
      error: (err: unknown) => {
        this.busy.set(false);
        input.value = '';
        const p = readProblem(err);
        this.problem.set(p.message);
        this.errors.set(Object.entries(p.fieldErrors).map(([path, message]) => ({ path, message })));
      },
    });
  }
}
