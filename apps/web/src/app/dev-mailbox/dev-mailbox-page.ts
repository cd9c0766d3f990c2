import { DatePipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, type OnInit, inject, signal } from '@angular/core';
import { MatButton } from '@angular/material/button';
import { MatButtonToggle, MatButtonToggleGroup } from '@angular/material/button-toggle';
import { RouterLink } from '@angular/router';
import type { CaughtMail, CaughtMailSummary } from '@clearbase/contracts';
import { readProblem } from '../problem/read-problem';
import { DevMailboxApi } from './dev-mailbox-api';

/** Development mailbox: the mail the local catcher caught, newest first, as text or as sandboxed HTML. */
@Component({
  selector: 'cb-dev-mailbox-page',
  imports: [DatePipe, RouterLink, MatButton, MatButtonToggleGroup, MatButtonToggle],
  templateUrl: './dev-mailbox-page.html',
  styleUrl: './dev-mailbox-page.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class DevMailboxPage implements OnInit {
  private readonly api = inject(DevMailboxApi);
  protected readonly messages = signal<CaughtMailSummary[]>([]);
  protected readonly selected = signal<CaughtMail | null>(null);
  protected readonly view = signal<'text' | 'html'>('text');
  protected readonly problem = signal<string | null>(null);
  protected readonly loading = signal(true);

  ngOnInit(): void {
    this.reload();
  }

  protected reload(): void {
    this.loading.set(true);
    this.api.list().subscribe({
      next: (list) => {
        this.loading.set(false);
        this.problem.set(null);
        this.messages.set(list);
      },
      error: (err: unknown) => {
        this.loading.set(false);
        this.problem.set(readProblem(err).message);
      },
    });
  }

  protected open(id: string): void {
    this.api.get(id).subscribe({
      next: (mail) => this.selected.set(mail),
      error: (err: unknown) => this.problem.set(readProblem(err).message),
    });
  }
}
