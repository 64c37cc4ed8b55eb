import { HttpTestingController } from '@angular/common/http/testing';
import { type ComponentFixture, TestBed } from '@angular/core/testing';
import { afterEach, describe, expect, it } from 'vitest';

import type { Project, Role, Stair } from '../core/api-types.js';
import { pageSpecProviders } from '../core/page-spec-providers.js';
import { ProjectPage, stairLine } from './project-page.js';

const PROJECT: Project = {
  id: '3b9d2f4e-6a1c-4e8b-9f2d-7c5a1e0b4d63',
  name: 'Alder Row, house 7',
  clientName: 'Kestrel & Finch Builders',
  siteAddress: '7 Alder Row\nMillbrook',
  notes: null,
  stairCount: 1,
  createdBy: { type: 'user', id: '1f6d4c2a-8b3e-4f71-9a0c-5e2b7d9c1a34' },
  createdAt: '2026-12-01T10:00:00.000Z',
  updatedAt: '2026-12-01T10:00:00.000Z',
};
// Alder Row corner unit (demo-scenario.md): 7 + 8 treads turning at a landing.
const CORNER: Stair = {
  id: '8e2c6a1f-4b7d-4c3e-a9f0-1d5b8e2c7a94',
  projectId: PROJECT.id,
  name: 'Corner stair',
  notes: null,
  input: {
    layout: 'tread-strips',
    staircase: { treads: 15, treadWidthMm: 900, riserHeightMm: 185, goingMm: 250, flights: [{ treads: 7, landingLengthMm: 900 }, { treads: 8 }] },
    treadStrip: { voltageV: 24, powerWPerM: 10, cutPitchMm: 50 },
    controller: { profileId: 'HL-K20' },
  },
  createdAt: '2026-12-01T10:00:00.000Z',
  updatedAt: '2026-12-01T10:00:00.000Z',
};

describe('ProjectPage', () => {
  let fixture: ComponentFixture<ProjectPage>;
  let http: HttpTestingController;

  async function render(role: Role, stairs: Stair[]): Promise<void> {
    TestBed.configureTestingModule({ providers: pageSpecProviders(role) });
    http = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(ProjectPage);
    fixture.componentRef.setInput('projectId', PROJECT.id);
    await fixture.whenStable();
    http.expectOne(`/v1/projects/${PROJECT.id}`).flush(PROJECT);
    http.expectOne((r) => r.url === `/v1/projects/${PROJECT.id}/stairs`).flush({ items: stairs, nextCursor: null });
    await fixture.whenStable();
  }

  afterEach(() => http.verify());
  const page = () => fixture.nativeElement as HTMLElement;

  it('lists the stairs with their shape, and offers an estimator a new stair', async () => {
    await render('estimator', [CORNER]);
    expect(page().querySelector('[data-testid="project-title"]')?.textContent).toBe('Alder Row, house 7');
    expect(page().querySelector('[data-testid="stair-link"]')?.textContent).toContain('15 treads in 2 flights');
    expect(page().querySelector('[data-testid="create-stair"]')).not.toBeNull();
  });

  it('gives a viewer no new-stair button, and says when there are no stairs', async () => {
    await render('viewer', []);
    expect(page().querySelector('[data-testid="create-stair"]')).toBeNull();
    expect(page().querySelector('[data-testid="stairs-empty"]')).not.toBeNull();
  });

  it('describes a corridor run without a staircase', () => {
    const corridor = { ...CORNER, input: { layout: 'rail-pixels', railPixels: { lengthM: 18, pixelsPerM: 60, voltageV: 5, protocol: 'one-wire-800k' }, controller: { profileId: 'HL-K36' } } } as Stair;
    expect(stairLine(corridor)).toBe('corridor run · rail-pixels');
  });
});
