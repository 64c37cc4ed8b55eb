import { HttpTestingController } from '@angular/common/http/testing';
import { type ComponentFixture, TestBed } from '@angular/core/testing';
import { Router } from '@angular/router';
import { Subject } from 'rxjs';
import { afterEach, describe, expect, it, vi } from 'vitest';

import type { Batch, Role } from '../core/api-types.js';
import { pageSpecProviders } from '../core/page-spec-providers.js';
import { alderRowJob, alderRowJobDone } from './batch-fixtures.js';
import { BatchList } from './batch-list.js';
import { POLL_WAIT } from '../core/poll.js';

const RUNNING = alderRowJob();
const DONE = alderRowJobDone({ id: '7a4e1c9b-2d3f-4e5a-8b6c-0d1e2f3a4b5c', name: null });

describe('BatchList', () => {
  let fixture: ComponentFixture<BatchList>;
  let http: HttpTestingController;
  let clock: Subject<void>;

  async function render(role: Role, jobs: Batch[] = [RUNNING, DONE]): Promise<void> {
    clock = new Subject<void>();
    TestBed.configureTestingModule({ providers: [...pageSpecProviders(role), { provide: POLL_WAIT, useValue: () => clock.asObservable() }] });
    http = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(BatchList);
    http.expectOne((r) => r.url === '/v1/batches').flush({ items: jobs, nextCursor: null });
    await settle();
  }

  afterEach(() => http.verify());

  const page = () => fixture.nativeElement as HTMLElement;
  const settle = async () => {
    await new Promise((resolve) => setTimeout(resolve, 0));
    await fixture.whenStable();
  };
  const rows = () => [...page().querySelectorAll('li[data-id]')];

  it('lists each job with its status, rows done, rate and time left', async () => {
    await render('viewer');
    expect(rows()).toHaveLength(2);
    const [running, done] = rows();
    expect(running?.querySelector('[data-testid="batch-status"]')?.textContent?.trim()).toBe('Running');
    const facts = [...(running?.querySelectorAll('[data-testid="batch-facts"] > span') ?? [])].map((s) => s.textContent?.trim());
    expect(facts).toEqual(['6 / 24 rows', '3 rows/s', '6 s left', '1 failed']);
    expect(done?.textContent).toContain('Job 7a4e1c9b'); // no name: the start of its id
    expect(done?.querySelector('[data-testid="batch-facts"]')?.textContent).not.toContain('left');
    expect(running?.querySelector('a')?.getAttribute('href')).toBe(`/batches/${RUNNING.id}`);
  });

  it('refreshes while a job runs and stops once every job has ended', async () => {
    await render('viewer');
    clock.next();
    http.expectOne((r) => r.url === '/v1/batches').flush({ items: [alderRowJobDone(), DONE], nextCursor: null });
    await settle();
    expect(rows()[0]?.querySelector('[data-testid="batch-status"]')?.textContent?.trim()).toBe('Finished');
    expect(clock.observed).toBe(false);
  });

  it('gives a viewer no upload panel', async () => {
    await render('viewer');
    expect(page().querySelector('tw-batch-upload')).toBeNull();
  });

  it('says so when there is no job yet', async () => {
    await render('estimator', []);
    expect(page().querySelector('[data-testid="batches-empty"]')?.textContent).toContain('Choose a file of stairs above');
  });

  it('uploads a file with its name and detail, then opens the new job', async () => {
    await render('estimator', [DONE]);
    const navigate = vi.spyOn(TestBed.inject(Router), 'navigate').mockResolvedValue(true);
    const file = new File(['ref,layout\r\n'], 'alder-row.csv', { type: 'text/csv' });
    const input = page().querySelector<HTMLInputElement>('[data-testid="batch-file"]')!;
    Object.defineProperty(input, 'files', { value: [file] });
    input.dispatchEvent(new Event('change'));
    const name = page().querySelector<HTMLInputElement>('[data-testid="batch-name"]')!;
    name.value = 'Alder Row, plots 1-24';
    name.dispatchEvent(new Event('input'));
    const full = [...page().querySelectorAll<HTMLButtonElement>('[data-testid="batch-detail"] button')].find((b) => b.textContent?.includes('whole estimate'))!;
    full.click();
    await settle();
    expect(page().querySelector('[data-testid="batch-file-name"]')?.textContent).toBe('alder-row.csv');

    (page().querySelector('[data-testid="batch-start"]') as HTMLButtonElement).click();
    const post = http.expectOne((r) => r.method === 'POST' && r.url === '/v1/batches');
    expect(post.request.params.get('detail')).toBe('full');
    const body = post.request.body as FormData;
    expect(body.get('name')).toBe('Alder Row, plots 1-24');
    expect((body.get('file') as File).name).toBe('alder-row.csv');
    post.flush(alderRowJob({ status: 'queued' }), { status: 202, statusText: 'Accepted' });
    await settle();
    expect(navigate).toHaveBeenCalledWith(['/batches', RUNNING.id]);
  });

  it('refuses a file that is neither CSV nor NDJSON before sending it', async () => {
    await render('estimator', [DONE]);
    const input = page().querySelector<HTMLInputElement>('[data-testid="batch-file"]')!;
    Object.defineProperty(input, 'files', { value: [new File(['x'], 'stairs.xlsx')] });
    input.dispatchEvent(new Event('change'));
    (page().querySelector('[data-testid="batch-start"]') as HTMLButtonElement).click();
    await settle();
    expect(page().querySelector('[data-testid="batch-file-error"]')?.textContent).toContain('stairs.xlsx is neither');
    http.expectNone((r) => r.method === 'POST');
  });

  it('shows the API’s problem in a snackbar when it refuses the file', async () => {
    await render('estimator', [DONE]);
    const input = page().querySelector<HTMLInputElement>('[data-testid="batch-file"]')!;
    Object.defineProperty(input, 'files', { value: [new File(['"unclosed'], 'broken.csv')] });
    input.dispatchEvent(new Event('change'));
    (page().querySelector('[data-testid="batch-start"]') as HTMLButtonElement).click();
    http
      .expectOne((r) => r.method === 'POST')
      .flush({ title: 'Not CSV', status: 400, code: 'not_csv', detail: 'Line 1: an unclosed quote.' }, { status: 400, statusText: 'Bad Request' });
    await settle();
    expect(document.querySelector('.mat-mdc-snack-bar-label')?.textContent).toContain('Line 1: an unclosed quote.');
  });
});
