import { ChangeDetectionStrategy, Component, computed, inject } from '@angular/core';
import { RouterLink } from '@angular/router';
import { MatIcon } from '@angular/material/icon';
import { Session } from '../auth/session';
import { ClientConfig } from '../shell/client-config';
import { navEntriesFor } from '../shell/nav-entries';
import { roleLabel } from '../shell/role-label';
import { roleDuties } from './role-duties';

/** The first page after sign-in: who you are, what your role does here, and the pages open to you. */
@Component({
  selector: 'cb-home-page',
  imports: [RouterLink, MatIcon],
  templateUrl: './home-page.html',
  styleUrl: './home-page.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class HomePage {
  private readonly session = inject(Session);
  private readonly clientConfig = inject(ClientConfig);

  protected readonly user = this.session.user;
  protected readonly firstName = computed(() => (this.user()?.name ?? '').split(/\s+/)[0] ?? '');
  protected readonly roleLabel = computed(() => roleLabel(this.session.role()));
  protected readonly duties = computed(() => {
    const role = this.session.role();
    return role === null ? [] : roleDuties[role];
  });
  protected readonly pages = computed(() =>
    navEntriesFor(this.session.role(), { localFakes: this.clientConfig.localFakes() }).filter(
      (e) => e.name !== 'home',
    ),
  );
}
