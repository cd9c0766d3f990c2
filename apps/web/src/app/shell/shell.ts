import { BreakpointObserver } from '@angular/cdk/layout';
import { ChangeDetectionStrategy, Component, computed, inject } from '@angular/core';
import { toSignal } from '@angular/core/rxjs-interop';
import { Router, RouterLink, RouterLinkActive, RouterOutlet } from '@angular/router';
import { MatButton, MatIconButton } from '@angular/material/button';
import { MatDivider } from '@angular/material/divider';
import { MatIcon } from '@angular/material/icon';
import { MatListItem, MatListItemIcon, MatListItemTitle, MatNavList } from '@angular/material/list';
import { MatMenu, MatMenuItem, MatMenuTrigger } from '@angular/material/menu';
import { MatSidenav, MatSidenavContainer, MatSidenavContent } from '@angular/material/sidenav';
import { MatToolbar } from '@angular/material/toolbar';
import { map } from 'rxjs';
import { Session } from '../auth/session';
import { ClientConfig } from './client-config';
import { roleLabel } from './role-label';
import { type NavEntry, navEntriesFor } from './nav-entries';

/** The signed-in frame: toolbar with the user menu, side navigation for the user's role, the page. */
@Component({
  selector: 'cb-shell',
  imports: [
    RouterOutlet,
    RouterLink,
    RouterLinkActive,
    MatToolbar,
    MatSidenavContainer,
    MatSidenav,
    MatSidenavContent,
    MatNavList,
    MatListItem,
    MatListItemIcon,
    MatListItemTitle,
    MatIcon,
    MatIconButton,
    MatButton,
    MatMenu,
    MatMenuItem,
    MatMenuTrigger,
    MatDivider,
  ],
  templateUrl: './shell.html',
  styleUrl: './shell.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class Shell {
  private readonly session = inject(Session);
  private readonly router = inject(Router);
  private readonly clientConfig = inject(ClientConfig);

  protected readonly user = this.session.user;
  protected readonly roleLabel = computed(() => roleLabel(this.session.role()));
  protected readonly initials = computed(() =>
    (this.user()?.name ?? '')
      .split(/\s+/)
      .filter(Boolean)
      .slice(0, 2)
      .map((w) => w[0]?.toUpperCase() ?? '')
      .join(''),
  );
  /** Entries for the role, split into groups in menu order. */
  protected readonly groups = computed(() => {
    const entries = navEntriesFor(this.session.role(), { localFakes: this.clientConfig.localFakes() });
    const order: NavEntry['group'][] = ['work', 'admin', 'you'];
    return order
      .map((g) => ({ name: g, entries: entries.filter((e) => e.group === g) }))
      .filter((g) => g.entries.length > 0);
  });
  // Below this width the navigation slides over the page instead of sitting beside it (our layout choice).
  protected readonly narrow = toSignal(
    inject(BreakpointObserver)
      .observe('(max-width: 840px)')
      .pipe(map((s) => s.matches)),
    { initialValue: false },
  );

  protected closeIfNarrow(nav: MatSidenav): void {
    if (this.narrow()) void nav.close();
  }

  protected signOut(): void {
    this.session.signOut().subscribe(() => void this.router.navigateByUrl('/sign-in'));
  }
}
