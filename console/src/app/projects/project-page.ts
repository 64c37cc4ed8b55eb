import { DatePipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, computed, effect, inject, input, signal } from '@angular/core';
import { MatButton } from '@angular/material/button';
import { MatIcon } from '@angular/material/icon';
import { MatProgressBar } from '@angular/material/progress-bar';
import { RouterLink } from '@angular/router';
import { forkJoin, type Subscription } from 'rxjs';

import type { Project, Stair } from '../core/api-types.js';
import { Auth } from '../core/auth.js';
import { roleMay } from '../core/capabilities.js';
import { problemMessage } from '../core/problem-details.js';
import { LoadFailure } from '../core/load-failure.js';
import { ProjectsApi } from './projects-api.js';

type Loaded = { state: 'loading' } | { state: 'ready'; project: Project; stairs: Stair[] } | { state: 'failed'; reason: string };

/** A stair in one line: treads, flights and layout. */
export function stairLine(stair: Stair): string {
  const s = stair.input.staircase;
  const flights = s?.flights?.length ?? 1;
  const shape = s ? `${s.treads} treads${flights > 1 ? ` in ${flights} flights` : ''}` : 'corridor run';
  return `${shape} · ${stair.input.layout}`;
}

/** One project: client, site, notes and its stairs. */
@Component({
  selector: 'tw-project-page',
  imports: [DatePipe, RouterLink, MatButton, MatIcon, MatProgressBar, LoadFailure],
  template: `
    <a matButton routerLink="/projects" class="tw-back"><mat-icon svgIcon="tw:back" />Projects</a>
    @let d = loaded();
    @switch (d.state) {
      @case ('loading') {
        <mat-progress-bar mode="indeterminate" aria-label="Loading the project" />
      }
      @case ('failed') {
        <tw-load-failure data-testid="project-failed" what="The project" [reason]="d.reason" (retry)="load()" />
      }
      @case ('ready') {
        <header class="tw-page-head">
          <div>
            <h1 data-testid="project-title">{{ d.project.name }}</h1>
            <p>{{ d.project.clientName ?? 'No client' }}</p>
          </div>
          @if (mayWrite()) {
            <a matButton="filled" [routerLink]="['/projects', d.project.id, 'stairs', 'new']" data-testid="create-stair">
              <mat-icon svgIcon="tw:add" />
              New stair
            </a>
          }
        </header>
        <dl class="tw-facts">
          @if (d.project.siteAddress) {
            <dt>Site</dt>
            <dd class="tw-multiline">{{ d.project.siteAddress }}</dd>
          }
          @if (d.project.notes) {
            <dt>Notes</dt>
            <dd class="tw-multiline">{{ d.project.notes }}</dd>
          }
          <dt>Changed</dt>
          <dd>{{ d.project.updatedAt | date: 'medium' }}</dd>
        </dl>
        <h2 class="tw-section">Stairs</h2>
        @if (d.stairs.length === 0) {
          <section class="tw-empty" data-testid="stairs-empty">
            <p>No stairs yet.{{ mayWrite() ? ' Add one to measure and run it.' : '' }}</p>
          </section>
        } @else {
          <ul class="tw-stairs" data-testid="stair-list">
            @for (s of d.stairs; track s.id) {
              <li>
                <a [routerLink]="['/projects', d.project.id, 'stairs', s.id]" data-testid="stair-link">
                  <span class="tw-stair-name">{{ s.name }}</span>
                  <span class="tw-stair-meta">{{ line(s) }}</span>
                </a>
              </li>
            }
          </ul>
        }
      }
    }
  `,
  styleUrl: './project-page.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ProjectPage {
  private readonly api = inject(ProjectsApi);
  private readonly auth = inject(Auth);

  /** From the route (`:projectId`). */
  readonly projectId = input.required<string>();

  protected readonly loaded = signal<Loaded>({ state: 'loading' });
  protected readonly mayWrite = computed(() => roleMay(this.auth.role(), 'projects:write'));
  protected readonly line = stairLine;

  private pending?: Subscription;

  constructor() {
    effect(() => this.load());
  }

  protected load(): void {
    const id = this.projectId();
    this.loaded.set({ state: 'loading' });
    this.pending?.unsubscribe(); // a newer load wins over an answer still on its way
    this.pending = forkJoin([this.api.project(id), this.api.stairs(id)]).subscribe({
      next: ([project, stairs]) => this.loaded.set({ state: 'ready', project, stairs }),
      error: (error: unknown) => this.loaded.set({ state: 'failed', reason: problemMessage(error) }),
    });
  }
}
