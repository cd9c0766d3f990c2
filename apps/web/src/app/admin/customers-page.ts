import { DatePipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, computed, inject, signal } from '@angular/core';
import { MatButton } from '@angular/material/button';
import { MatDialog } from '@angular/material/dialog';
import { MatFormField, MatLabel, MatPrefix } from '@angular/material/form-field';
import { MatIcon } from '@angular/material/icon';
import { MatInput } from '@angular/material/input';
import { MatProgressBar } from '@angular/material/progress-bar';
import { MatSnackBar } from '@angular/material/snack-bar';
import type { UserRecord } from '@clearbase/contracts';
import { readProblem } from '../problem/read-problem';
import { CounterCustomerDialog } from './counter-customer-dialog';
import { CustomersApi } from './customers-api';

/** Staff: the lab's customers, found by name or e-mail, and a new account opened at the counter. */
@Component({
  selector: 'cb-customers-page',
  imports: [DatePipe, MatButton, MatIcon, MatFormField, MatLabel, MatPrefix, MatInput, MatProgressBar],
  templateUrl: './customers-page.html',
  styleUrl: './customers-page.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class CustomersPage {
  private readonly api = inject(CustomersApi);
  private readonly dialog = inject(MatDialog);
  private readonly snackBar = inject(MatSnackBar);

  protected readonly customers = signal<UserRecord[]>([]);
  protected readonly loading = signal(true);
  protected readonly problem = signal<string | null>(null);
  protected readonly filter = signal('');
  protected readonly shown = computed(() => {
    const words = this.filter().trim().toLowerCase();
    if (!words) return this.customers();
    return this.customers().filter((c) => `${c.name} ${c.email}`.toLowerCase().includes(words));
  });

  constructor() {
    this.load();
  }

  private load(): void {
    this.loading.set(true);
    this.api.list().subscribe({
      next: (list) => {
        this.customers.set(list);
        this.loading.set(false);
      },
      error: (err: unknown) => {
        this.problem.set(readProblem(err).message);
        this.loading.set(false);
      },
    });
  }

  protected openCreate(): void {
    this.dialog
      .open<CounterCustomerDialog, void, UserRecord>(CounterCustomerDialog, {
        autoFocus: 'first-tabbable',
        width: '480px',
      })
      .afterClosed()
      .subscribe((user) => {
        if (!user) return;
        this.load();
        this.snackBar.open(
          `${user.name}'s account is open; the e-mail to choose a password is on its way.`,
          undefined,
          {
            duration: 5000,
          },
        );
      });
  }
}
