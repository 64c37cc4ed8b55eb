import { DatePipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, computed, inject, signal } from '@angular/core';
import { MatButton } from '@angular/material/button';
import { MatDialog } from '@angular/material/dialog';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIcon } from '@angular/material/icon';
import { MatInput } from '@angular/material/input';
import { MatProgressBar } from '@angular/material/progress-bar';
import { Router, RouterLink } from '@angular/router';
import { firstValueFrom } from 'rxjs';

import type { Project } from '../core/api-types.js';
import { Auth } from '../core/auth.js';
import { roleMay } from '../core/capabilities.js';
import { problemMessage } from '../core/problem-details.js';
import { LoadFailure } from '../core/load-failure.js';
import { ProjectCreateDialog } from './project-create-dialog.js';
import { ProjectsApi } from './projects-api.js';

type Listing = { state: 'loading' } | { state: 'ready'; projects: Project[] } | { state: 'failed'; reason: string };

/** Words a search matches: name, client and site. */
export function projectMatches(project: Project, query: string): boolean {
  const words = query.toLowerCase().split(/\s+/).filter(Boolean);
  const text = [project.name, project.clientName ?? '', project.siteAddress ?? ''].join(' ').toLowerCase();
  return words.every((w) => text.includes(w));
}

/** The organisation's projects, newest change first, with a search. */
@Component({
  selector: 'tw-project-list',
  imports: [DatePipe, RouterLink, MatButton, MatIcon, MatProgressBar, MatFormFieldModule, MatInput, LoadFailure],
  template: `
    <header class="tw-page-head">
      <div>
        <h1>Projects</h1>
        <p>Each job's stairs, the estimates they ran, and what a re-run changed.</p>
      </div>
      @if (mayWrite()) {
        <button matButton="filled" type="button" data-testid="create-project" (click)="create()">
          <mat-icon svgIcon="tw:add" />
          New project
        </button>
      }
    </header>

    @let list = listing();
    @switch (list.state) {
      @case ('loading') {
        <mat-progress-bar mode="indeterminate" aria-label="Loading projects" />
      }
      @case ('failed') {
        <tw-load-failure data-testid="projects-failed" what="The projects" [reason]="list.reason" (retry)="load()" />
      }
      @case ('ready') {
        @if (list.projects.length === 0) {
          <section class="tw-empty" data-testid="projects-empty">
            <h2>No projects yet</h2>
            <p>{{ mayWrite() ? 'Start one for a job, then add its stairs.' : 'An estimator of your organisation starts projects.' }}</p>
          </section>
        } @else {
          <mat-form-field appearance="outline" class="tw-search">
            <mat-label>Search</mat-label>
            <input matInput type="search" data-testid="project-search" placeholder="Name, client or site" (input)="query.set($any($event.target).value)" />
          </mat-form-field>
          <ul class="tw-projects" data-testid="project-list">
            @for (p of shown(); track p.id) {
              <li>
                <a [routerLink]="['/projects', p.id]" data-testid="project-link">
                  <span class="tw-project-name">{{ p.name }}</span>
                  <span class="tw-project-meta">
                    {{ p.clientName ?? 'No client' }} · {{ p.stairCount }} stair{{ p.stairCount === 1 ? '' : 's' }} · changed {{ p.updatedAt | date: 'mediumDate' }}
                  </span>
                </a>
              </li>
            } @empty {
              <li class="tw-no-match" data-testid="projects-no-match">No project matches “{{ query() }}”.</li>
            }
          </ul>
        }
      }
    }
  `,
  styleUrl: './project-list.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ProjectList {
  private readonly api = inject(ProjectsApi);
  private readonly dialog = inject(MatDialog);
  private readonly router = inject(Router);
  private readonly auth = inject(Auth);

  protected readonly listing = signal<Listing>({ state: 'loading' });
  protected readonly query = signal('');
  protected readonly mayWrite = computed(() => roleMay(this.auth.role(), 'projects:write'));
  protected readonly shown = computed(() => {
    const list = this.listing();
    if (list.state !== 'ready') return [];
    const sorted = [...list.projects].sort((a, b) => b.updatedAt.localeCompare(a.updatedAt));
    return sorted.filter((p) => projectMatches(p, this.query()));
  });

  constructor() {
    this.load();
  }

  protected load(): void {
    this.listing.set({ state: 'loading' });
    this.api.projects().subscribe({
      next: (projects) => this.listing.set({ state: 'ready', projects }),
      error: (error: unknown) => this.listing.set({ state: 'failed', reason: problemMessage(error) }),
    });
  }

  protected async create(): Promise<void> {
    const ref = this.dialog.open<ProjectCreateDialog, void, Project>(ProjectCreateDialog, { width: '520px', maxWidth: '95vw' });
    const project = await firstValueFrom(ref.afterClosed());
    if (project) await this.router.navigate(['/projects', project.id]);
  }
}
