import { OverlayContainer } from '@angular/cdk/overlay';
import { Location } from '@angular/common';
import { HttpTestingController } from '@angular/common/http/testing';
import { type ComponentFixture, TestBed } from '@angular/core/testing';
import { afterEach, describe, expect, it, vi } from 'vitest';

import { alderRowTownhouseResponse } from '../../../../../shared/schemas/estimate-examples.js';
import type { EstimateResponse, Role, StoredEstimate } from '../../core/api-types.js';
import { pageSpecProviders } from '../../core/page-spec-providers.js';
import { ESTIMATE_ID, PRICE_CHANGE, PROJECT_ID, SALTMARSH_INPUT, STAIR_ID, USER_ID } from '../saltmarsh-fixtures.js';
import { EstimatePage } from './estimate-page.js';

const RESULT = alderRowTownhouseResponse as unknown as EstimateResponse;
const PRICED: EstimateResponse = {
  ...RESULT,
  currency: 'EUR',
  pricing: { source: 'stored', catalogVersion: 21, currency: 'EUR', taxRatePercent: 20, net: 310.4, tax: 62.08, gross: 372.48, complete: true, unpricedLines: 0 },
};
const ESTIMATE: StoredEstimate = {
  id: ESTIMATE_ID,
  projectId: PROJECT_ID,
  stairId: STAIR_ID,
  engineVersion: '2.1.0',
  catalogVersion: 21,
  pricingSource: 'stored',
  ranBy: { type: 'user', id: USER_ID },
  createdAt: '2026-12-01T10:00:00.000Z',
  rerunOf: null,
  input: SALTMARSH_INPUT,
  result: PRICED,
};
const RERUN_ID = '5d1e9a7c-3b2f-4e6a-8c0d-1f2e3a4b5c6d';
const CHANGES = PRICE_CHANGE;

describe('EstimatePage', () => {
  let fixture: ComponentFixture<EstimatePage>;
  let http: HttpTestingController;

  async function render(role: Role): Promise<void> {
    TestBed.configureTestingModule({ providers: pageSpecProviders(role) });
    http = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(EstimatePage);
    fixture.componentRef.setInput('estimateId', ESTIMATE.id);
    await fixture.whenStable();
    http.expectOne(`/v1/estimates/${ESTIMATE.id}`).flush(ESTIMATE);
    await settle();
  }

  afterEach(() => http.verify());
  const page = () => fixture.nativeElement as HTMLElement;
  const overlay = () => TestBed.inject(OverlayContainer).getContainerElement();
  const settle = async () => {
    await new Promise((resolve) => setTimeout(resolve, 0));
    await fixture.whenStable();
  };

  it('shows the totals, every check with its suggestion, the cautions, the charts and the cut plan', async () => {
    await render('viewer');
    const totals = page().querySelector('[data-testid="totals"]')!.textContent!;
    expect(totals).toContain('119 W');
    expect(totals).toContain('372.48 EUR');
    expect(page().querySelectorAll('[data-testid="check"]')).toHaveLength(RESULT.checks.length);
    const warned = RESULT.checks.find((c) => c.status === 'warn')!;
    expect(page().querySelector('[data-testid="checks"]')!.textContent).toContain(warned.suggestion!);
    expect(page().querySelector('[data-testid="cautions"] li')?.textContent).toContain(RESULT.cautions[0]!.message);
    expect(page().querySelectorAll('[data-testid="drop-chart"] [data-testid="bar"]')).toHaveLength(RESULT.treads.length);
    expect(page().querySelectorAll('[data-testid="output-chart"] [data-testid="bar"]')).toHaveLength(RESULT.outputs.cv.length);
    const pieces = RESULT.reels.treads!.plan.reduce((n, reel) => n + reel.piecesMm.length, 0);
    expect(page().querySelectorAll('[data-testid="reel-piece"]')).toHaveLength(pieces);
    expect(page().querySelector('[data-testid="gross"]')?.textContent).toContain('372.48');
    expect(page().querySelectorAll('[data-testid="cables"] li')).toHaveLength(RESULT.cables.length + 1); // and the sensors
    expect(page().querySelector('[data-testid="pixel-run"]')).toBeNull(); // tread strips only
  });

  it('gives a viewer the downloads but no re-run', async () => {
    await render('viewer');
    expect(page().querySelector('[data-testid="rerun"]')).toBeNull();
    expect(page().querySelector('[data-testid="download-document.pdf"]')).not.toBeNull();
  });

  it('shows the trace behind a figure on demand', async () => {
    await render('viewer');
    const how = page().querySelector<HTMLButtonElement>('[data-figure="totalLoadW"] button')!;
    how.click();
    await settle();
    expect(overlay().querySelector('[data-testid="trace-list"]')?.textContent).toContain('treadStrips.totalLoadW');
  });

  it('re-runs, highlights what changed, and names the new estimate in the address', async () => {
    await render('estimator');
    const replace = vi.spyOn(TestBed.inject(Location), 'replaceState');
    (page().querySelector('[data-testid="rerun"]') as HTMLButtonElement).click();
    const rerun = http.expectOne(`/v1/estimates/${ESTIMATE.id}/rerun`);
    expect(rerun.request.method).toBe('POST');
    rerun.flush({ ...ESTIMATE, id: RERUN_ID, rerunOf: ESTIMATE.id, catalogVersion: 22, result: { ...PRICED, pricing: { ...PRICED.pricing!, gross: 379.68 } }, changes: CHANGES });
    await settle();
    const panel = page().querySelector('[data-testid="rerun-changes"]')!;
    expect([...panel.querySelectorAll('[data-testid="changed-figure"]')].map((li) => li.textContent?.replace(/\s+/g, ' ').trim())).toEqual([
      'Catalog version 21 → 22',
      'Net total 310.4 → 316.4',
      'Gross total 372.48 → 379.68',
    ]);
    expect(page().querySelector('[data-figure="bomGross"]')?.classList).toContain('tw-changed');
    expect(page().querySelector('[data-figure="totalLoadW"]')?.classList).not.toContain('tw-changed');
    expect(replace).toHaveBeenCalledWith(`/projects/estimates/${RERUN_ID}`);
  });

  it('downloads the PDF through the API with the file name it gives, as a Blob', async () => {
    await render('viewer');
    const created = vi.spyOn(URL, 'createObjectURL').mockReturnValue('blob:estimate');
    const click = vi.spyOn(HTMLAnchorElement.prototype, 'click').mockImplementation(() => undefined);
    (page().querySelector('[data-testid="download-document.pdf"]') as HTMLButtonElement).click();
    const req = http.expectOne(`/v1/estimates/${ESTIMATE.id}/document.pdf`);
    expect(req.request.responseType).toBe('blob');
    req.flush(new Blob(['%PDF-1.7'], { type: 'application/pdf' }), { headers: { 'Content-Disposition': 'attachment; filename="saltmarsh-cottage-staircase-main-stair-estimate-2026-12-01.pdf"' } });
    await settle();
    expect(created).toHaveBeenCalledWith(expect.any(Blob));
    const link = click.mock.contexts[0] as HTMLAnchorElement;
    expect(link.download).toBe('saltmarsh-cottage-staircase-main-stair-estimate-2026-12-01.pdf');
    created.mockRestore();
    click.mockRestore();
  });

  it('shows the problem when the estimate cannot be loaded', async () => {
    TestBed.configureTestingModule({ providers: pageSpecProviders('viewer') });
    http = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(EstimatePage);
    fixture.componentRef.setInput('estimateId', 'missing');
    await fixture.whenStable();
    http.expectOne('/v1/estimates/missing').flush({ title: 'Not found', status: 404, detail: 'No such stored estimate in this organisation.' }, { status: 404, statusText: 'Not Found' });
    await settle();
    expect(page().querySelector('[data-testid="estimate-failed"]')?.textContent).toContain('No such stored estimate');
  });
});
