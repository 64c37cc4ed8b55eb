import { HttpTestingController } from '@angular/common/http/testing';
import { type ComponentFixture, TestBed } from '@angular/core/testing';
import { afterEach, describe, expect, it } from 'vitest';

import type { Project, Role } from '../core/api-types.js';
import { pageSpecProviders } from '../core/page-spec-providers.js';
import { ProjectList, projectMatches } from './project-list.js';

// Invented projects (demo-scenario.md and api/db/demo-data.ts).
const SALTMARSH: Project = {
  id: '3b9d2f4e-6a1c-4e8b-9f2d-7c5a1e0b4d63',
  name: 'Saltmarsh Cottage staircase',
  clientName: 'Wren & Tansy Holiday Lets',
  siteAddress: '4 Saltmarsh Row\nPort Aster',
  notes: null,
  stairCount: 1,
  createdBy: { type: 'user', id: '1f6d4c2a-8b3e-4f71-9a0c-5e2b7d9c1a34' },
  createdAt: '2026-11-30T10:00:00.000Z',
  updatedAt: '2026-12-01T10:00:00.000Z',
};
const ALDER: Project = { ...SALTMARSH, id: '8e2c6a1f-4b7d-4c3e-a9f0-1d5b8e2c7a94', name: 'Alder Row, house 7', clientName: 'Kestrel & Finch Builders', siteAddress: '7 Alder Row\nMillbrook', updatedAt: '2026-12-02T08:00:00.000Z' };

describe('ProjectList', () => {
  let fixture: ComponentFixture<ProjectList>;
  let http: HttpTestingController;

  async function render(role: Role, projects: Project[] | 'fail' = [SALTMARSH, ALDER]): Promise<void> {
    TestBed.configureTestingModule({ providers: pageSpecProviders(role) });
    http = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(ProjectList);
    const req = http.expectOne((r) => r.url === '/v1/projects');
    if (projects === 'fail') req.flush({ title: 'Forbidden', status: 403, detail: 'Needs the viewer role.' }, { status: 403, statusText: 'Forbidden' });
    else req.flush({ items: projects, nextCursor: null });
    await fixture.whenStable();
  }

  afterEach(() => http.verify());
  const page = () => fixture.nativeElement as HTMLElement;
  const names = () => [...page().querySelectorAll('.tw-project-name')].map((e) => e.textContent?.trim());

  it('lists the newest change first and searches name, client and site', async () => {
    await render('estimator');
    expect(names()).toEqual(['Alder Row, house 7', 'Saltmarsh Cottage staircase']);
    const search = page().querySelector<HTMLInputElement>('[data-testid="project-search"]')!;
    search.value = 'port aster';
    search.dispatchEvent(new Event('input'));
    await fixture.whenStable();
    expect(names()).toEqual(['Saltmarsh Cottage staircase']);
    search.value = 'nowhere';
    search.dispatchEvent(new Event('input'));
    await fixture.whenStable();
    expect(page().querySelector('[data-testid="projects-no-match"]')).not.toBeNull();
  });

  it('offers an estimator a new project, a viewer not', async () => {
    await render('estimator');
    expect(page().querySelector('[data-testid="create-project"]')).not.toBeNull();
    TestBed.resetTestingModule();
    await render('viewer');
    expect(page().querySelector('[data-testid="create-project"]')).toBeNull();
  });

  it('says so when there are no projects, and shows the problem when they cannot load', async () => {
    await render('viewer', []);
    expect(page().querySelector('[data-testid="projects-empty"]')).not.toBeNull();
    TestBed.resetTestingModule();
    await render('viewer', 'fail');
    expect(page().querySelector('[data-testid="projects-failed"]')?.textContent).toContain('Needs the viewer role.');
  });

  it('matches every word of a search', () => {
    expect(projectMatches(ALDER, 'alder millbrook')).toBe(true);
    expect(projectMatches(ALDER, 'alder aster')).toBe(false);
  });
});
