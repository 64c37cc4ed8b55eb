import { CurrencyPipe, DatePipe, DecimalPipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, computed, effect, inject, input, signal } from '@angular/core';
import { MatButton } from '@angular/material/button';
import { MatIcon } from '@angular/material/icon';
import { MatProgressBar } from '@angular/material/progress-bar';
import { MatSnackBar } from '@angular/material/snack-bar';
import { Router, RouterLink } from '@angular/router';
import { firstValueFrom, forkJoin, type Observable, of, type Subscription } from 'rxjs';

import type { EstimateRequest, Project, Staircase, Stair, StoredEstimateSummary } from '../core/api-types.js';
import { Auth } from '../core/auth.js';
import { roleMay } from '../core/capabilities.js';
import { CreationKey } from '../core/idempotency.js';
import { problemMessage, readProblem } from '../core/problem-details.js';
import { LoadFailure } from '../core/load-failure.js';
import { KitOptions } from './kit-options.js';
import { ProjectsApi } from './projects-api.js';
import { StairEditor } from './stair-editor.js';
import { NEW_STAIR, type StairForm, hasTreadStrip, requestOf, stairForm } from './stair-form.js';

type Loaded =
  | { state: 'loading' }
  | { state: 'ready'; project: Project; stair: Stair | null; estimates: StoredEstimateSummary[]; form: StairForm; base: EstimateRequest }
  | { state: 'failed'; reason: string };

/** One stair: the editor with its side view, running it, the estimates it stored, and kit options. */
@Component({
  selector: 'tw-stair-page',
  imports: [CurrencyPipe, DatePipe, DecimalPipe, RouterLink, MatButton, MatIcon, MatProgressBar, StairEditor, KitOptions, LoadFailure],
  templateUrl: './stair-page.html',
  styleUrl: './stair-page.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class StairPage {
  private readonly api = inject(ProjectsApi);
  private readonly auth = inject(Auth);
  private readonly router = inject(Router);
  private readonly snackBar = inject(MatSnackBar);
  private readonly keys = new CreationKey();

  /** From the route; no stair id on the new-stair page. */
  readonly projectId = input.required<string>();
  readonly stairId = input<string>();

  protected readonly loaded = signal<Loaded>({ state: 'loading' });
  protected readonly busy = signal<'saving' | 'running' | null>(null);
  protected readonly failure = signal<string[]>([]);
  /** The stair the kit options were asked for: taken when asked, so typing does not call the API. */
  protected readonly optionsFor = signal<Staircase | null>(null);
  protected readonly mayWrite = computed(() => roleMay(this.auth.role(), 'projects:write'));
  protected readonly maySize = computed(() => roleMay(this.auth.role(), 'sizing:run'));
  protected readonly treadStrip = hasTreadStrip;

  private pending?: Subscription;

  constructor() {
    effect(() => this.load());
  }

  protected load(): void {
    const projectId = this.projectId();
    const stairId = this.stairId();
    this.loaded.set({ state: 'loading' });
    const stair: Observable<Stair | null> = stairId ? this.api.stair(projectId, stairId) : of(null);
    const estimates: Observable<StoredEstimateSummary[]> = stairId ? this.api.estimates(projectId, stairId) : of([]);
    this.pending?.unsubscribe(); // a newer load wins over an answer still on its way
    this.pending = forkJoin([this.api.project(projectId), stair, estimates]).subscribe({
      next: ([project, stair, estimates]) => {
        const base = stair?.input ?? NEW_STAIR;
        const form = stairForm(stair?.name ?? 'Main stair', base);
        if (!this.mayWrite()) form.disable();
        const newestFirst = [...estimates].sort((a, b) => b.createdAt.localeCompare(a.createdAt));
        this.loaded.set({ state: 'ready', project, stair, estimates: newestFirst, form, base });
      },
      error: (error: unknown) => this.loaded.set({ state: 'failed', reason: problemMessage(error) }),
    });
  }

  /** Saves the form; answers the stair as stored, or null when the form or the API refused it. */
  protected async save(): Promise<Stair | null> {
    const d = this.loaded();
    if (d.state !== 'ready') return null;
    if (d.form.invalid) {
      d.form.markAllAsTouched();
      this.failure.set(['Some fields need fixing first; each says why beside it.']);
      return null;
    }
    const value = d.form.getRawValue();
    const input = requestOf(value, d.base);
    this.busy.set('saving');
    this.failure.set([]);
    try {
      if (!d.stair) {
        const request = { name: value.name.trim(), input };
        const created = await firstValueFrom(this.api.createStair(d.project.id, request, this.keys.for(request)));
        await this.router.navigate(['/projects', d.project.id, 'stairs', created.id], { replaceUrl: true });
        return created;
      }
      const saved = await firstValueFrom(this.api.patchStair(d.project.id, d.stair.id, { name: value.name.trim(), input }));
      d.form.markAsPristine();
      this.loaded.set({ ...d, stair: saved, base: saved.input });
      this.tell('Saved.');
      return saved;
    } catch (error) {
      this.keys.failed(error);
      this.failure.set(problemLines(error));
      return null;
    } finally {
      this.busy.set(null);
    }
  }

  /** Saves what changed, runs the stair, and opens the estimate. */
  protected async run(): Promise<void> {
    const d = this.loaded();
    if (d.state !== 'ready' || !d.stair) return;
    if (d.form.dirty && !(await this.save())) return;
    this.busy.set('running');
    try {
      const estimate = await firstValueFrom(this.api.run(d.project.id, d.stair.id));
      await this.router.navigate(['/projects', 'estimates', estimate.id]);
    } catch (error) {
      this.failure.set(problemLines(error));
      this.tell(problemMessage(error));
    } finally {
      this.busy.set(null);
    }
  }

  /** Asks for kit options for the stair as the form stands. */
  protected findKits(d: Extract<Loaded, { state: 'ready' }>): void {
    this.optionsFor.set(requestOf(d.form.getRawValue(), d.base).staircase ?? null);
  }

  private tell(message: string): void {
    this.snackBar.open(message, 'Dismiss', { duration: 6000 });
  }
}

/** The problem's detail, then each field it names (`staircase.treads: …`). */
function problemLines(error: unknown): string[] {
  const problem = readProblem(error) as { errors?: { path: string; message: string }[] } | null;
  const fields = (problem?.errors ?? []).map((e) => `${e.path}: ${e.message}`);
  return [problemMessage(error), ...fields];
}
