import { OverlayContainer } from '@angular/cdk/overlay';
import { HttpTestingController } from '@angular/common/http/testing';
import { type ComponentFixture, TestBed } from '@angular/core/testing';
import { Subject } from 'rxjs';
import { afterEach, describe, expect, it, vi } from 'vitest';

import type { Batch, Role } from '../core/api-types.js';
import { pageSpecProviders } from '../core/page-spec-providers.js';
import { alderRowJob, alderRowJobDone } from './batch-fixtures.js';
import { BatchPage } from './batch-page.js';
import { POLL_WAIT } from '../core/poll.js';

const JOB = alderRowJob();
const SELF = `/v1/batches/${JOB.id}`;

describe('BatchPage', () => {
  let fixture: ComponentFixture<BatchPage>;
  let http: HttpTestingController;
  let clock: Subject<void>;
  let waits: number[];

  async function render(role: Role, first: Batch = JOB, retryAfter = '2'): Promise<void> {
    clock = new Subject<void>();
    waits = [];
    const wait = (ms: number) => {
      waits.push(ms);
      return clock.asObservable();
    };
    TestBed.configureTestingModule({ providers: [...pageSpecProviders(role), { provide: POLL_WAIT, useValue: wait }] });
    http = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(BatchPage);
    fixture.componentRef.setInput('batchId', JOB.id);
    await fixture.whenStable();
    http.expectOne(SELF).flush(first, { headers: { 'Retry-After': retryAfter } });
    await settle();
  }

  afterEach(() => http.verify());

  const page = () => fixture.nativeElement as HTMLElement;
  const overlay = () => TestBed.inject(OverlayContainer).getContainerElement();
  const text = (testid: string) => page().querySelector(`[data-testid="${testid}"]`)?.textContent?.replace(/\s+/g, ' ').trim();
  const settle = async () => {
    await new Promise((resolve) => setTimeout(resolve, 0));
    await fixture.whenStable();
  };
  const tick = async () => {
    clock.next();
    await settle();
  };

  it('watches a running job as Retry-After says and stops asking once it has ended', async () => {
    await render('viewer', JOB, '3');
    expect(text('batch-title')).toBe('Alder Row, plots 1-24');
    expect(text('batch-progress')).toBe('6 of 24 rows answered (25%) · 3 rows/s · 6 s left');
    expect(waits).toEqual([3000]);

    await tick();
    http.expectOne(SELF).flush(alderRowJob({ rows: { ...JOB.rows, done: 18, ok: 16 }, progress: 0.75, etaSeconds: 2 }), { headers: { 'Retry-After': '2' } });
    await settle();
    expect(text('batch-progress')).toContain('18 of 24 rows answered (75%)');

    await tick();
    http.expectOne(SELF).flush(alderRowJobDone());
    await settle();
    expect(text('batch-status')).toBe('Finished');
    expect(text('batch-progress')).toBe('24 of 24 rows answered (100%)');
    expect(clock.observed).toBe(false); // no timer left running
    await tick();
    http.expectNone(SELF);
  });

  it('stops asking when the page is left while the job still runs', async () => {
    await render('viewer');
    expect(clock.observed).toBe(true);
    fixture.destroy();
    expect(clock.observed).toBe(false);
    clock.next();
    http.expectNone(SELF);
  });

  it('asks before cancelling, naming the job, and cancels only when confirmed', async () => {
    await render('estimator');
    (page().querySelector('[data-testid="batch-cancel"]') as HTMLButtonElement).click();
    await settle();
    expect(overlay().querySelector('[data-testid="cancel-title"]')?.textContent).toContain('Cancel “Alder Row, plots 1-24”?');
    const keep = [...overlay().querySelectorAll('button')].find((b) => b.textContent?.includes('Keep it running'))!;
    keep.click();
    await settle();
    http.expectNone(`${SELF}/cancel`);

    (page().querySelector('[data-testid="batch-cancel"]') as HTMLButtonElement).click();
    await settle();
    (overlay().querySelector('[data-testid="cancel-confirm"]') as HTMLButtonElement).click();
    await settle();
    const cancel = http.expectOne(`${SELF}/cancel`);
    expect(cancel.request.method).toBe('POST');
    cancel.flush(alderRowJob({ status: 'cancelled', stopReason: 'cancelled', etaSeconds: null, finishedAt: '2026-12-02T09:00:04.000Z' }));
    await settle();
    expect(text('batch-status')).toBe('Cancelled');
    expect(page().querySelector('[data-testid="batch-cancel"]')).toBeNull(); // only while it runs
    expect(clock.observed).toBe(false);
  });

  it('offers a viewer the downloads but no cancel', async () => {
    await render('viewer');
    expect(page().querySelector('[data-testid="batch-cancel"]')).toBeNull();
    expect(page().querySelector('[data-testid="download-csv"]')).not.toBeNull();
  });

  it('offers no cancel for a job that has ended', async () => {
    await render('admin', alderRowJobDone());
    expect(page().querySelector('[data-testid="batch-cancel"]')).toBeNull();
    expect(waits).toEqual([]); // final at the first answer: never asked again
  });

  it('downloads the results CSV and the error report through the API', async () => {
    await render('viewer', alderRowJobDone());
    const created = vi.spyOn(URL, 'createObjectURL').mockReturnValue('blob:batch');
    const click = vi.spyOn(HTMLAnchorElement.prototype, 'click').mockImplementation(() => undefined);
    try {
      (page().querySelector('[data-testid="download-csv"]') as HTMLButtonElement).click();
      const results = http.expectOne((r) => r.url === `${SELF}/results`);
      expect(results.request.params.get('format')).toBe('csv');
      expect(results.request.responseType).toBe('blob');
      results.flush(new Blob(['row,ref,status\r\n']), { headers: { 'Content-Disposition': 'attachment; filename="alder-row-results.csv"' } });
      await settle();
      expect((click.mock.contexts[0] as HTMLAnchorElement).download).toBe('alder-row-results.csv');

      (page().querySelector('[data-testid="download-errors"]') as HTMLButtonElement).click();
      const errors = http.expectOne((r) => r.url === `${SELF}/errors`);
      expect(errors.request.params.get('format')).toBe('csv');
      errors.flush(new Blob(['row,ref,status\r\n']));
      await settle();
      expect((click.mock.contexts[1] as HTMLAnchorElement).download).toBe('treadwise-batch-3d1f7c2a-errors.csv');
    } finally {
      created.mockRestore();
      click.mockRestore();
    }
  });

  it('shows the problem when the job cannot be found', async () => {
    clock = new Subject<void>();
    TestBed.configureTestingModule({ providers: [...pageSpecProviders('viewer'), { provide: POLL_WAIT, useValue: () => clock }] });
    http = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(BatchPage);
    fixture.componentRef.setInput('batchId', 'missing');
    await fixture.whenStable();
    http.expectOne('/v1/batches/missing').flush({ title: 'Not found', status: 404, detail: 'No such batch job in this organisation.' }, { status: 404, statusText: 'Not Found' });
    await settle();
    expect(text('batch-failed')).toContain('No such batch job in this organisation.');
  });
});
