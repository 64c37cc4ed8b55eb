import { OverlayContainer } from '@angular/cdk/overlay';
import { HttpTestingController } from '@angular/common/http/testing';
import { type ComponentFixture, TestBed } from '@angular/core/testing';
import { afterEach, describe, expect, it } from 'vitest';

import type { CatalogImportReport, Role, StoredCatalog, StoredCatalogItem } from '../core/api-types.js';
import { pageSpecProviders } from '../core/page-spec-providers.js';
import { CatalogPage } from './catalog-page.js';

// Items of Harbor Lane's invented demo catalog (demo-scenario.md).
const CATALOG: StoredCatalog = { currency: 'EUR', taxRatePercent: 20, version: 3, itemCount: 3, activeItemCount: 3, updatedAt: '2026-12-01T10:00:00.000Z' };
const STRIP: StoredCatalogItem = { sku: 'HL-S24-10', kind: 'strip', unitPrice: 39, voltageV: 24, powerWPerM: 10, cutPitchMm: 50, active: true };
const DRIVER: StoredCatalogItem = { sku: 'HL-D24-100', kind: 'driver', unitPrice: 34, voltageV: 24, ratingW: 100, active: true };
const CABLE: StoredCatalogItem = { sku: 'HL-C050', kind: 'cable', unitPrice: 0.6, crossSectionMm2: 0.5, cores: 2 } as StoredCatalogItem;

describe('CatalogPage', () => {
  let fixture: ComponentFixture<CatalogPage>;
  let http: HttpTestingController;

  async function render(role: Role, items: StoredCatalogItem[] = [STRIP, DRIVER, CABLE]): Promise<void> {
    TestBed.configureTestingModule({ providers: pageSpecProviders(role) });
    http = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(CatalogPage);
    http.expectOne('/v1/catalog').flush(CATALOG);
    http.expectOne((req) => req.url === '/v1/catalog/items').flush({ items, nextCursor: null });
    await settle();
  }

  afterEach(() => http.verify());

  const page = () => fixture.nativeElement as HTMLElement;
  const overlay = () => TestBed.inject(OverlayContainer).getContainerElement();
  const settle = async () => {
    await new Promise((resolve) => setTimeout(resolve, 0));
    await fixture.whenStable();
  };
  const skus = () => [...page().querySelectorAll('tr[data-sku]')].map((r) => r.getAttribute('data-sku'));

  it('lists every item, sorts by price and filters by text', async () => {
    await render('admin');
    expect(skus()).toEqual(['HL-S24-10', 'HL-D24-100', 'HL-C050']);

    const priceHeader = [...page().querySelectorAll('th')].find((th) => th.textContent?.includes('Unit price'))!;
    (priceHeader.querySelector('.mat-sort-header-container') as HTMLElement).click();
    await settle();
    expect(skus()).toEqual(['HL-C050', 'HL-D24-100', 'HL-S24-10']);

    const filter = page().querySelector<HTMLInputElement>('[data-testid="catalog-filter"]')!;
    filter.value = 'driver';
    filter.dispatchEvent(new Event('input'));
    await settle();
    expect(skus()).toEqual(['HL-D24-100']);
  });

  it('pages through a long catalog', async () => {
    const many = Array.from({ length: 30 }, (_, i): StoredCatalogItem => ({ ...DRIVER, sku: `HL-D-${String(i).padStart(2, '0')}` }));
    await render('admin', many);
    expect(skus()).toHaveLength(25);
  });

  it('gives a viewer no import, edit or retire controls', async () => {
    await render('viewer');
    expect(page().querySelector('tw-catalog-import')).toBeNull();
    expect(page().querySelector('[data-testid="edit-item"]')).toBeNull();
    expect(page().querySelector('[data-testid="retire-item"]')).toBeNull();
    expect(page().querySelector('[data-testid="catalog-export"]')).not.toBeNull(); // reading is allowed
  });

  it('retires an item and shows it retired', async () => {
    await render('admin');
    (page().querySelector('tr[data-sku="HL-D24-100"] [data-testid="retire-item"]') as HTMLButtonElement).click();
    http.expectOne((req) => req.method === 'DELETE' && req.url === '/v1/catalog/items/HL-D24-100').flush({ ...DRIVER, active: false });
    await settle();
    expect(page().querySelector('tr[data-sku="HL-D24-100"] [data-testid="item-state"]')?.textContent?.trim()).toBe('retired');
    expect(page().querySelector('tr[data-sku="HL-D24-100"] [data-testid="restore-item"]')).not.toBeNull();
  });

  it('sends only the changed price from the edit dialog', async () => {
    await render('admin');
    (page().querySelector('tr[data-sku="HL-S24-10"] [data-testid="edit-item"]') as HTMLButtonElement).click();
    await settle();
    const price = overlay().querySelector<HTMLInputElement>('[data-testid="item-price"]')!;
    price.value = '41.5';
    price.dispatchEvent(new Event('input'));
    (overlay().querySelector('[data-testid="item-save"]') as HTMLButtonElement).click();
    await settle();
    const patch = http.expectOne((req) => req.method === 'PATCH' && req.url === '/v1/catalog/items/HL-S24-10');
    expect(patch.request.body).toEqual({ unitPrice: 41.5 });
    patch.flush({ ...STRIP, unitPrice: 41.5 });
    await settle();
    expect(page().querySelector('tr[data-sku="HL-S24-10"]')?.textContent).toContain('41.50');
  });

  it('shows the dry run report first and imports only after confirmation', async () => {
    await render('admin');
    const file = new File(['sku,kind\n'], 'harbor-lane.csv', { type: 'text/csv' });
    const input = page().querySelector<HTMLInputElement>('[data-testid="catalog-file"]')!;
    Object.defineProperty(input, 'files', { value: [file] });
    input.dispatchEvent(new Event('change'));
    const dry = http.expectOne((req) => req.url === '/v1/catalog/imports');
    expect(dry.request.params.get('dryRun')).toBe('true');
    const report: CatalogImportReport = { dryRun: true, imported: false, rows: 3, created: 1, updated: 1, unchanged: 1, version: 4, errors: [] };
    dry.flush(report);
    await settle();
    expect(page().querySelector('[data-testid="import-report"]')?.textContent).toContain('1 would be new');

    (page().querySelector('[data-testid="import-confirm"]') as HTMLButtonElement).click();
    const real = http.expectOne((req) => req.url === '/v1/catalog/imports');
    expect(real.request.params.get('dryRun')).toBe('false');
    real.flush({ ...report, dryRun: false, imported: true });
    await settle();
    // The table reloads with what was imported.
    http.expectOne('/v1/catalog').flush({ ...CATALOG, version: 4 });
    http.expectOne((req) => req.url === '/v1/catalog/items').flush({ items: [STRIP], nextCursor: null });
    await settle();
    expect(page().querySelector('[data-testid="import-done"]')?.textContent).toContain('Imported 3 rows');
    expect(skus()).toEqual(['HL-S24-10']);
  });

  it('lists the bad rows of a file and offers no import', async () => {
    await render('admin');
    const input = page().querySelector<HTMLInputElement>('[data-testid="catalog-file"]')!;
    Object.defineProperty(input, 'files', { value: [new File(['x'], 'bad.csv', { type: 'text/csv' })] });
    input.dispatchEvent(new Event('change'));
    http.expectOne((req) => req.url === '/v1/catalog/imports').flush({
      dryRun: true,
      imported: false,
      rows: 2,
      created: 0,
      updated: 0,
      unchanged: 0,
      version: 3,
      errors: [{ row: 3, column: 'unitPrice', message: 'must be a number' }],
    } satisfies CatalogImportReport);
    await settle();
    expect(page().querySelector('[data-testid="import-errors"]')?.textContent).toContain('must be a number');
    expect(page().querySelector('[data-testid="import-confirm"]')).toBeNull();
  });

  it('says so when the catalog is empty', async () => {
    await render('admin', []);
    expect(page().querySelector('[data-testid="catalog-empty"]')).not.toBeNull();
  });

  it('shows the problem detail when the catalog cannot be loaded', async () => {
    TestBed.configureTestingModule({ providers: pageSpecProviders('viewer') });
    http = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(CatalogPage);
    http.expectOne('/v1/catalog').flush({ title: 'Forbidden', status: 403, detail: 'Needs the catalog:read scope.' }, { status: 403, statusText: 'Forbidden' });
    http.match((req) => req.url === '/v1/catalog/items'); // cancelled with the failed pair
    await settle();
    expect(page().querySelector('[data-testid="catalog-failed"]')?.textContent).toContain('Needs the catalog:read scope.');
  });
});
