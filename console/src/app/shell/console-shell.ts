import { BreakpointObserver } from '@angular/cdk/layout';
import { ChangeDetectionStrategy, Component, computed, inject, signal } from '@angular/core';
import { toSignal } from '@angular/core/rxjs-interop';
import { MatButton, MatIconButton } from '@angular/material/button';
import { MatDivider } from '@angular/material/divider';
import { MatIcon } from '@angular/material/icon';
import { MatListItem, MatListItemIcon, MatListItemTitle, MatNavList } from '@angular/material/list';
import { MatMenu, MatMenuItem, MatMenuTrigger } from '@angular/material/menu';
import { MatSidenav, MatSidenavContainer, MatSidenavContent } from '@angular/material/sidenav';
import { MatSnackBar } from '@angular/material/snack-bar';
import { MatToolbar } from '@angular/material/toolbar';
import { Router, RouterLink, RouterLinkActive, RouterOutlet } from '@angular/router';
import { map } from 'rxjs';

import type { OrganizationRef } from '../core/api-types.js';
import { Auth } from '../core/auth.js';
import { ColorScheme } from '../core/color-scheme.js';
import { problemMessage } from '../core/problem-details.js';
import { destinationsFor } from './navigation.js';
import { OrganizationsApi } from './organizations.js';

// Below this width the navigation slides over the page instead of taking a column.
const COMPACT_QUERY = '(max-width: 719.98px)';

/** The signed-in frame: toolbar with the organisation and the account, navigation by role, the page. */
@Component({
  selector: 'tw-console-shell',
  imports: [
    RouterOutlet,
    RouterLink,
    RouterLinkActive,
    MatToolbar,
    MatButton,
    MatIconButton,
    MatIcon,
    MatDivider,
    MatMenu,
    MatMenuItem,
    MatMenuTrigger,
    MatSidenav,
    MatSidenavContainer,
    MatSidenavContent,
    MatNavList,
    MatListItem,
    MatListItemIcon,
    MatListItemTitle,
  ],
  templateUrl: './console-shell.html',
  styleUrl: './console-shell.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ConsoleShell {
  private readonly auth = inject(Auth);
  private readonly organizationsApi = inject(OrganizationsApi);
  private readonly snackBar = inject(MatSnackBar);
  private readonly router = inject(Router);
  protected readonly colorScheme = inject(ColorScheme);

  protected readonly user = this.auth.user;
  protected readonly organization = this.auth.organization;
  protected readonly role = this.auth.role;
  protected readonly destinations = computed(() => destinationsFor(this.role(), this.user()?.operator === true));
  protected readonly compact = toSignal(
    inject(BreakpointObserver)
      .observe(COMPACT_QUERY)
      .pipe(map((state) => state.matches)),
    { initialValue: false },
  );
  /** The operator's full list, loaded when the switcher first opens. */
  private readonly allOrganizations = signal<OrganizationRef[] | null>(null);
  protected readonly choices = computed<OrganizationRef[]>(() => {
    const session = this.auth.session();
    if (!session) return [];
    return this.allOrganizations() ?? session.memberships.map((m) => m.organization);
  });

  protected loadChoices(): void {
    if (!this.user()?.operator || this.allOrganizations()) return;
    this.organizationsApi.list().subscribe({
      next: (organizations) => this.allOrganizations.set(organizations),
      error: (error: unknown) => this.snackBar.open(problemMessage(error), 'Dismiss', { duration: 8000 }),
    });
  }

  protected async switchTo(organization: OrganizationRef): Promise<void> {
    if (organization.id === this.organization()?.id) return;
    try {
      await this.auth.switchOrganization(organization.slug);
      this.snackBar.open(`Now acting in ${organization.name}.`, undefined, { duration: 3000 });
      // Reload the page under the new organisation; a page the new role may not see falls back.
      await this.router.navigateByUrl('/', { skipLocationChange: true });
      await this.router.navigateByUrl(this.destinations()[0]?.path ?? '/status');
    } catch (error) {
      this.snackBar.open(problemMessage(error), 'Dismiss', { duration: 8000 });
    }
  }

  protected signOut(): void {
    void this.auth.signOut();
  }
}
