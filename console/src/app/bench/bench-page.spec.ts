import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { provideZonelessChangeDetection, signal } from '@angular/core';
import { type ComponentFixture, TestBed } from '@angular/core/testing';
import { MATERIAL_ANIMATIONS } from '@angular/material/core';
import { afterEach, describe, expect, it } from 'vitest';

import type { Role } from '../core/api-types.js';
import { Auth } from '../core/auth.js';
import { BenchPage } from './bench-page.js';

describe('BenchPage', () => {
  let fixture: ComponentFixture<BenchPage>;
  let http: HttpTestingController;

  async function render(role: Role): Promise<void> {
    TestBed.configureTestingModule({
      providers: [
        provideZonelessChangeDetection(),
        provideHttpClient(),
        provideHttpClientTesting(),
        { provide: MATERIAL_ANIMATIONS, useValue: { animationsDisabled: true } },
        { provide: Auth, useValue: { role: signal<Role | null>(role) } },
      ],
    });
    http = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(BenchPage);
    await fixture.whenStable();
  }

  afterEach(() => http.verify());
  const page = () => fixture.nativeElement as HTMLElement;
  const settle = async () => {
    await new Promise((resolve) => setTimeout(resolve, 0));
    await fixture.whenStable();
  };
  const input = (field: string) => page().querySelector<HTMLInputElement>(`[data-field="${field}"] input`)!;
  const type = (field: string, value: string) => {
    input(field).value = value;
    input(field).dispatchEvent(new Event('input'));
  };

  it('offers a viewer no calculations (the API needs the estimator role)', async () => {
    await render('viewer');
    expect(page().querySelector('[data-testid="bench-not-allowed"]')).not.toBeNull();
    expect(page().querySelector('[data-testid="bench-calculate"]')).toBeNull();
  });

  it('sends the voltage-drop form and shows the answer with its warnings', async () => {
    await render('estimator');
    expect(page().querySelectorAll('[role="tab"]').length).toBe(5);
    type('lengthM', '8');
    page().querySelector<HTMLButtonElement>('[data-testid="bench-calculate"]')!.click();
    await settle();
    const call = http.expectOne((r) => r.method === 'POST' && r.url === '/v1/calculations/voltage-drop');
    expect(call.request.body).toEqual({ supplyVoltageV: 24, currentA: 0.354, lengthM: 8, conductor: { crossSectionMm2: 0.5 } });
    call.flush({
      resistanceOhmPerKm: 39,
      loopResistanceOhm: 0.624,
      dropV: 0.2209,
      dropPercent: 0.92,
      voltageAtLoadV: 23.779,
      maxDropPercent: 5,
      withinLimit: true,
      conductorTable: 'iec60228-class5',
      temperatureC: 20,
      loadDistribution: 'end',
      currentRatingA: 3,
      warnings: [{ code: 'long_run', message: 'The run is long.' }],
      engineVersion: '2.1.0',
      trace: [],
    });
    await settle();
    const answer = page().querySelector('[data-testid="bench-answer"]')!;
    expect(answer.textContent).toContain('0.221 V');
    expect(answer.textContent).toContain('23.779 V');
    expect(answer.querySelector('[data-code="long_run"]')?.textContent).toContain('The run is long.');
  });

  it('keeps an out-of-bounds value beside its field and sends nothing', async () => {
    await render('estimator');
    type('supplyVoltageV', '2000');
    page().querySelector<HTMLButtonElement>('[data-testid="bench-calculate"]')!.click();
    await settle();
    http.expectNone('/v1/calculations/voltage-drop');
    expect(page().querySelector('[data-field="supplyVoltageV"] [data-testid="field-error"]')?.textContent).toContain('At most 1000.');
  });

  it('shows the API’s refusal beside the field it names', async () => {
    await render('admin');
    page().querySelector<HTMLButtonElement>('[data-testid="bench-calculate"]')!.click();
    await settle();
    http.expectOne('/v1/calculations/voltage-drop').flush(
      { title: 'Validation failed', status: 400, code: 'validation_failed', detail: 'The request body is not valid.', errors: [{ path: 'conductor.crossSectionMm2', message: 'no 0.5 mm² in this table' }] },
      { status: 400, statusText: 'Bad Request' },
    );
    await settle();
    expect(page().querySelector('[data-field="conductor.crossSectionMm2"] [data-testid="field-error"]')?.textContent).toContain('no 0.5 mm² in this table');
    expect(page().querySelector('[data-testid="bench-failure"]')?.textContent).toContain('The request body is not valid.');
  });
});
