import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { provideZonelessChangeDetection } from '@angular/core';
import { type ComponentFixture, TestBed } from '@angular/core/testing';
import { afterEach, describe, expect, it } from 'vitest';

import type { KitDesign, KitOptionsResponse } from '../core/api-types.js';
import { KitOptions } from './kit-options.js';

const STAIR = { treads: 12, treadWidthMm: 1000, riserHeightMm: 180, goingMm: 260 };
const SUMMARY = { treads: 12, litTreads: 12, controllers: 1, totalLoadW: 115.2, driverCount: 1, longestRunM: 2.6, worstDropPercent: 2.1, motionSensors: 2, reels: 3, checks: { pass: 16, warn: 0, fail: 0 } };
const PRICING = { source: 'stored' as const, catalogVersion: 3, currency: 'EUR', taxRatePercent: 20, net: 250, tax: 50, gross: 300, complete: true, unpricedLines: 0 };
const design = (rank: number, stripSku: string, gross: number): KitDesign => ({
  rank,
  choices: { stripSku, voltageV: 24, powerWPerM: 10, cutPitchMm: 50, controllerSku: 'HL-K20', controllerPosition: 'middle', driverPosition: 'middle' },
  pricing: { ...PRICING, gross },
  summary: SUMMARY,
  cart: [{ sku: stripSku, quantity: 3, unitPrice: 39 }],
  fillable: true,
  unpriced: [],
  warnings: [],
  estimateRequest: { layout: 'tread-strips', staircase: STAIR, treadStrip: { voltageV: 24, powerWPerM: 10, cutPitchMm: 50 }, controller: { profileId: 'HL-K20' } },
});
const ANSWER: KitOptionsResponse = {
  engineVersion: '2.1.0',
  layout: 'tread-strips',
  currency: 'EUR',
  rankedBy: 'Cheapest gross total first.',
  designs: [design(1, 'HL-S24-10', 300), design(2, 'HL-S12-07', 320)],
  possible: 6,
  candidates: 6,
  capped: false,
  passed: 2,
  failed: 4,
  overBudget: 0,
  failuresByCheck: { 'output-current': 4 },
  pruned: [],
  cautions: [{ code: 'mains', message: 'Mains work is for a licensed electrician.' }],
  pricingSource: 'stored',
  catalogVersion: 3,
  trace: [],
};

describe('KitOptions', () => {
  let fixture: ComponentFixture<KitOptions>;
  let http: HttpTestingController;

  async function render(answer: KitOptionsResponse): Promise<void> {
    TestBed.configureTestingModule({ providers: [provideZonelessChangeDetection(), provideHttpClient(), provideHttpClientTesting()] });
    http = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(KitOptions);
    fixture.componentRef.setInput('staircase', STAIR);
    await fixture.whenStable();
    const req = http.expectOne('/v1/estimates/options');
    expect(req.request.body).toEqual({ layout: 'tread-strips', staircase: STAIR, limit: 3 });
    req.flush(answer);
    await fixture.whenStable();
  }

  afterEach(() => http.verify());
  const page = () => fixture.nativeElement as HTMLElement;

  it('puts the kits side by side, cheapest first, with their price and parts', async () => {
    await render(ANSWER);
    const kits = [...page().querySelectorAll('[data-testid="kit"]')];
    expect(kits).toHaveLength(2);
    expect(kits[0]!.textContent).toContain('HL-S24-10');
    expect(kits[0]!.textContent).toContain('€300.00');
    expect(kits[1]!.textContent).toContain('HL-S12-07');
    expect(page().querySelector('[data-testid="options-tally"]')?.textContent).toContain('2 pass, 4 fail');
  });

  it('says why when no kit passes', async () => {
    await render({ ...ANSWER, designs: [], passed: 0, failed: 6, failuresByCheck: { 'output-current': 6 } });
    expect(page().querySelector('[data-testid="options-empty"]')?.textContent).toContain('output-current');
  });
});
