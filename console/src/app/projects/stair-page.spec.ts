import { HttpTestingController } from '@angular/common/http/testing';
import { type ComponentFixture, TestBed } from '@angular/core/testing';
import { Router } from '@angular/router';
import { afterEach, describe, expect, it, vi } from 'vitest';

import type { Role, StoredEstimate } from '../core/api-types.js';
import { pageSpecProviders } from '../core/page-spec-providers.js';
import { PROJECT_ID, SALTMARSH_PROJECT, SALTMARSH_STAIR, STAIR_ID } from './saltmarsh-fixtures.js';
import { StairPage } from './stair-page.js';

const PROJECT = SALTMARSH_PROJECT;
const STAIR = SALTMARSH_STAIR;

describe('StairPage', () => {
  let fixture: ComponentFixture<StairPage>;
  let http: HttpTestingController;

  async function render(role: Role, stair = STAIR): Promise<void> {
    TestBed.configureTestingModule({ providers: pageSpecProviders(role) });
    http = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(StairPage);
    fixture.componentRef.setInput('projectId', PROJECT_ID);
    fixture.componentRef.setInput('stairId', STAIR_ID);
    await fixture.whenStable();
    http.expectOne(`/v1/projects/${PROJECT_ID}`).flush(PROJECT);
    http.expectOne(`/v1/projects/${PROJECT_ID}/stairs/${STAIR_ID}`).flush(stair);
    http.expectOne((r) => r.url === `/v1/projects/${PROJECT_ID}/stairs/${STAIR_ID}/estimates`).flush({ items: [], nextCursor: null });
    await settle();
  }

  afterEach(() => http.verify());
  const page = () => fixture.nativeElement as HTMLElement;
  const settle = async () => {
    await new Promise((resolve) => setTimeout(resolve, 0));
    await fixture.whenStable();
  };
  async function type(testId: string, value: string): Promise<void> {
    const field = page().querySelector<HTMLInputElement>(`[data-testid="${testId}"]`)!;
    field.value = value;
    field.dispatchEvent(new Event('input'));
    field.dispatchEvent(new Event('blur'));
    await settle();
  }
  const litTreads = () => page().querySelectorAll('[data-testid="lit-tread"]').length;

  it('redraws the side view as the treads change, and keeps the last good drawing while a field is out of bounds', async () => {
    await render('estimator');
    expect(litTreads()).toBe(12);
    expect(page().querySelector('[data-testid="lit-rail"]')).toBeNull(); // tread strips only
    await type('field-treads', '15');
    expect(litTreads()).toBe(15);
    await type('field-treads', '201');
    expect(litTreads()).toBe(15);
    expect(page().textContent).toContain('A whole number from 1 to 200.'); // beside the field
  });

  it('draws a landing when the stair is split into flights, and lights it when ticked', async () => {
    await render('estimator');
    (page().querySelector('[data-testid="add-flight"]') as HTMLButtonElement).click();
    await settle();
    expect(page().querySelectorAll('[data-testid="flight"]')).toHaveLength(2);
    expect(page().querySelectorAll('[data-testid="landing"]')).toHaveLength(1);
    (page().querySelector('[data-testid="flight"] input[type="checkbox"]') as HTMLInputElement).click();
    await settle();
    expect(page().querySelectorAll('[data-testid="lit-landing"]')).toHaveLength(1);
  });

  it('saves the edited stair and then runs it, opening the estimate', async () => {
    await render('estimator');
    const navigate = vi.spyOn(TestBed.inject(Router), 'navigate').mockResolvedValue(true);
    await type('field-goingMm', '270');
    (page().querySelector('[data-testid="run-stair"]') as HTMLButtonElement).click();
    await settle();
    const patch = http.expectOne((r) => r.method === 'PATCH' && r.url === `/v1/projects/${PROJECT_ID}/stairs/${STAIR_ID}`);
    expect(patch.request.body.input.staircase).toEqual({ treads: 12, treadWidthMm: 1000, riserHeightMm: 180, goingMm: 270 });
    patch.flush({ ...STAIR, input: patch.request.body.input });
    await settle();
    http.expectOne((r) => r.method === 'POST' && r.url === `/v1/projects/${PROJECT_ID}/stairs/${STAIR_ID}/estimates`).flush({ id: 'c4a7e1d9-2f6b-4a8c-b3e5-9d0f1a2b6c78' } as StoredEstimate);
    await settle();
    expect(navigate).toHaveBeenCalledWith(['/projects', 'estimates', 'c4a7e1d9-2f6b-4a8c-b3e5-9d0f1a2b6c78']);
  });

  it('asks for kit options once for the numbers of the moment, not on every keystroke', async () => {
    await render('estimator');
    (page().querySelector('[data-testid="show-options"]') as HTMLButtonElement).click();
    await settle();
    const first = http.expectOne('/v1/estimates/options');
    expect(first.request.body.staircase).toEqual(STAIR.input.staircase);
    await type('field-treads', '13');
    http.expectNone('/v1/estimates/options');
    (page().querySelector('[data-testid="show-options"]') as HTMLButtonElement).click();
    await settle();
    expect(http.expectOne('/v1/estimates/options').request.body.staircase.treads).toBe(13);
  });

  it('draws a handrail-only stair with its treads unlit and asks nothing about a tread strip', async () => {
    // Quayside-style rail run along a stair (demo-scenario.md): pixels on the rail, none on the treads.
    const rail = {
      ...STAIR,
      input: {
        layout: 'rail-pixels',
        staircase: STAIR.input.staircase,
        railPixels: { lengthM: 4, pixelsPerM: 60, voltageV: 5, protocol: 'one-wire-800k' },
        controller: { profileId: 'HL-K20' },
      },
    } as typeof STAIR;
    await render('estimator', rail);
    expect(litTreads()).toBe(0);
    expect(page().querySelector('[data-testid="lit-rail"]')).not.toBeNull(); // the handrail is lit instead
    expect(page().querySelector('[data-testid="field-voltageV"]')).toBeNull();
    expect(page().querySelector('[data-testid="show-options"]')).toBeNull(); // kit options size tread strips only
  });

  it('does not send a stair the API would refuse', async () => {
    await render('estimator');
    await type('field-riserHeightMm', '20');
    (page().querySelector('[data-testid="save-stair"]') as HTMLButtonElement).click();
    await settle();
    http.expectNone((r) => r.method === 'PATCH');
    expect(page().querySelector('[data-testid="stair-failure"]')).not.toBeNull();
    expect(page().textContent).toContain('From 50 to 400.');
  });

  it('creates a new stair under an Idempotency-Key and opens it', async () => {
    TestBed.configureTestingModule({ providers: pageSpecProviders('estimator') });
    http = TestBed.inject(HttpTestingController);
    const navigate = vi.spyOn(TestBed.inject(Router), 'navigate').mockResolvedValue(true);
    fixture = TestBed.createComponent(StairPage);
    fixture.componentRef.setInput('projectId', PROJECT_ID);
    await fixture.whenStable();
    http.expectOne(`/v1/projects/${PROJECT_ID}`).flush(PROJECT);
    await settle();
    expect(page().querySelector('[data-testid="run-stair"]')).toBeNull(); // nothing to run before it is saved
    await type('stair-name', 'Stair to the loft');
    (page().querySelector('[data-testid="save-stair"]') as HTMLButtonElement).click();
    await settle();
    const create = http.expectOne((r) => r.method === 'POST' && r.url === `/v1/projects/${PROJECT_ID}/stairs`);
    expect(create.request.headers.get('Idempotency-Key')).toMatch(/^[0-9a-f]{32}$/);
    expect(create.request.body).toMatchObject({ name: 'Stair to the loft', input: { layout: 'tread-strips', staircase: { treads: 14 }, controller: { profileId: 'HL-K20' } } });
    create.flush({ ...STAIR, name: 'Stair to the loft' }, { status: 201, statusText: 'Created' });
    await settle();
    expect(navigate).toHaveBeenCalledWith(['/projects', PROJECT_ID, 'stairs', STAIR_ID], { replaceUrl: true });
  });

  it('shows the fields the API refused, beside its detail', async () => {
    await render('estimator');
    await type('field-goingMm', '270');
    (page().querySelector('[data-testid="save-stair"]') as HTMLButtonElement).click();
    await settle();
    http
      .expectOne((r) => r.method === 'PATCH')
      .flush(
        { title: 'Invalid request', status: 400, detail: 'The request has 1 invalid field.', code: 'validation_failed', errors: [{ path: 'input.controller.profileId', message: 'no controller HL-K20 in the catalog' }] },
        { status: 400, statusText: 'Bad Request' },
      );
    await settle();
    const failure = page().querySelector('[data-testid="stair-failure"]')!.textContent!;
    expect(failure).toContain('The request has 1 invalid field.');
    expect(failure).toContain('input.controller.profileId: no controller HL-K20 in the catalog');
  });

  it('shows a viewer the stair read only, without save or run', async () => {
    await render('viewer');
    expect(page().querySelector('[data-testid="save-stair"]')).toBeNull();
    expect(page().querySelector('[data-testid="run-stair"]')).toBeNull();
    expect(page().querySelector<HTMLInputElement>('[data-testid="field-treads"]')!.disabled).toBe(true);
    expect(page().querySelector('[data-testid="show-options"]')).toBeNull();
    expect(page().querySelector('[data-testid="add-flight"]')).toBeNull();
    expect(litTreads()).toBe(12); // the drawing is still there
  });
});
