import { DatePipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, inject, signal } from '@angular/core';
import { MatButton } from '@angular/material/button';
import { MatProgressBar } from '@angular/material/progress-bar';
import { MatOption, MatSelect } from '@angular/material/select';
import { MatSnackBar } from '@angular/material/snack-bar';
import { MatTableModule } from '@angular/material/table';
import { firstValueFrom } from 'rxjs';

import type { Organization } from '../core/api-types.js';
import { problemMessage } from '../core/problem-details.js';
import { OperatorApi } from './operator-api.js';
import { planChoices } from './plans.js';

type Listing =
  | { state: 'loading' }
  | { state: 'ready'; organizations: Organization[]; nextCursor: string | null }
  | { state: 'failed'; reason: string };

/** The operator's list of every organisation, with the plan each is on and a way to move it. */
@Component({
  selector: 'tw-organization-plans',
  imports: [DatePipe, MatTableModule, MatButton, MatSelect, MatOption, MatProgressBar],
  templateUrl: './organization-plans.html',
  styleUrl: './operator-table.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class OrganizationPlans {
  private readonly api = inject(OperatorApi);
  private readonly snackBar = inject(MatSnackBar);

  protected readonly columns = ['name', 'slug', 'plan', 'created'] as const;
  protected readonly planChoices = planChoices;
  protected readonly listing = signal<Listing>({ state: 'loading' });
  protected readonly loadingMore = signal(false);
  protected readonly busyIds = signal<ReadonlySet<string>>(new Set());

  constructor() {
    this.load();
  }

  protected load(): void {
    this.listing.set({ state: 'loading' });
    this.api.organizations().subscribe({
      next: (page) => this.listing.set({ state: 'ready', organizations: page.items, nextCursor: page.nextCursor }),
      error: (error: unknown) => this.listing.set({ state: 'failed', reason: problemMessage(error) }),
    });
  }

  protected loadMore(): void {
    const current = this.listing();
    if (current.state !== 'ready' || !current.nextCursor) return;
    this.loadingMore.set(true);
    this.api.organizations(current.nextCursor).subscribe({
      next: (page) => {
        this.loadingMore.set(false);
        this.listing.set({ state: 'ready', organizations: [...current.organizations, ...page.items], nextCursor: page.nextCursor });
      },
      error: (error: unknown) => {
        this.loadingMore.set(false);
        this.tell(problemMessage(error));
      },
    });
  }

  protected async changePlan(organization: Organization, planId: string): Promise<void> {
    if (planId === organization.planId) return;
    this.setBusy(organization.id, true);
    try {
      const updated = await firstValueFrom(this.api.changePlan(organization.id, planId));
      this.replace(updated);
      this.tell(`${updated.name} is now on the ${updated.planId} plan; its limits apply from the next call.`);
    } catch (error) {
      this.replace({ ...organization }); // the select shows the plan the API kept
      this.tell(problemMessage(error));
    } finally {
      this.setBusy(organization.id, false);
    }
  }

  private replace(organization: Organization): void {
    const current = this.listing();
    if (current.state !== 'ready') return;
    this.listing.set({ ...current, organizations: current.organizations.map((o) => (o.id === organization.id ? organization : o)) });
  }

  private setBusy(id: string, busy: boolean): void {
    const next = new Set(this.busyIds());
    if (busy) next.add(id);
    else next.delete(id);
    this.busyIds.set(next);
  }

  private tell(message: string): void {
    this.snackBar.open(message, 'Dismiss', { duration: 6000 });
  }
}
