import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { provideZonelessChangeDetection } from '@angular/core';
import { type ComponentFixture, TestBed } from '@angular/core/testing';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';

import { CLOCK } from '../core/clock.js';
import { provideConsoleIcons } from '../core/console-icons.js';
import type { Health, Readiness } from '../core/health-api.js';
import { StatusPage } from './status-page.js';

// Answers shaped as the API's health contract describes them (GET /v1/health, GET /v1/health/ready);
// the values are invented for these tests.
const LIVE: Health = {
  status: 'ok',
  service: 'treadwise-api',
  version: '0.1.0',
  engineVersion: '1.0.0',
  time: '2026-03-14T18:30:00.000Z',
};
const READY: Readiness = { status: 'ready', checks: { database: 'ok' } };
const NOT_READY = {
  type: 'https://treadwise.example/problems/not-ready',
  title: 'Not ready',
  status: 503,
  detail: 'The database did not answer within 2 s.',
  code: 'not_ready',
  requestId: 'req_3c9e1a',
};
const PROBLEM_HEADERS = { 'Content-Type': 'application/problem+json' };
const CHECKED_AT = new Date('2026-03-14T18:30:02.000Z');

describe('StatusPage', () => {
  let fixture: ComponentFixture<StatusPage>;
  let http: HttpTestingController;

  beforeEach(async () => {
    TestBed.configureTestingModule({
      providers: [
        provideZonelessChangeDetection(),
        provideHttpClient(),
        provideHttpClientTesting(),
        provideConsoleIcons(),
        { provide: CLOCK, useValue: () => CHECKED_AT },
      ],
    });
    http = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(StatusPage);
    await fixture.whenStable();
  });

  afterEach(() => http.verify());

  function byTestId(testId: string): HTMLElement | null {
    return (fixture.nativeElement as HTMLElement).querySelector(`[data-testid="${testId}"]`);
  }

  function text(testId: string): string {
    return byTestId(testId)?.textContent?.trim() ?? '';
  }

  async function answerBoth(): Promise<void> {
    http.expectOne('/v1/health').flush(LIVE);
    http.expectOne('/v1/health/ready').flush(READY);
    await fixture.whenStable();
  }

  it('shows both checks as in progress until the API answers', async () => {
    expect(text('api-status')).toContain('Checking'); // StatusBadge label for a pending check
    expect(text('db-status')).toContain('Checking');
    expect(byTestId('checked-at')).toBeNull();
    await answerBoth();
  });

  it('shows the API as healthy when the health check answers ok', async () => {
    await answerBoth();
    expect(text('api-status')).toContain('Healthy'); // StatusBadge label; the browser test reads it too
    expect(byTestId('api-status')?.getAttribute('data-state')).toBe('healthy');
  });

  it('shows the API and engine versions from the health answer', async () => {
    await answerBoth();
    // Expected values are the LIVE fixture's.
    expect(text('api-service')).toBe(LIVE.service);
    expect(text('api-version')).toBe(LIVE.version);
    expect(text('engine-version')).toBe(LIVE.engineVersion);
    expect(byTestId('api-time')?.getAttribute('datetime')).toBe(LIVE.time);
  });

  it('leaves the engine version out when the API does not report one', async () => {
    const { engineVersion: _omitted, ...withoutEngine } = LIVE;
    http.expectOne('/v1/health').flush(withoutEngine);
    http.expectOne('/v1/health/ready').flush(READY);
    await fixture.whenStable();
    expect(text('api-version')).toBe(LIVE.version);
    expect(byTestId('engine-version')).toBeNull();
  });

  it('shows the database as healthy when readiness reports the database ok', async () => {
    await answerBoth();
    expect(text('db-status')).toContain('Healthy');
    expect(byTestId('db-reason')).toBeNull();
  });

  it('shows the database as unavailable when readiness answers 503', async () => {
    http.expectOne('/v1/health').flush(LIVE);
    http
      .expectOne('/v1/health/ready')
      .flush(NOT_READY, { status: 503, statusText: 'Service Unavailable', headers: PROBLEM_HEADERS });
    await fixture.whenStable();
    expect(text('db-status')).toContain('Unavailable'); // StatusBadge label for a failed check
    expect(text('db-status')).not.toContain('Healthy');
    expect(text('db-reason')).toBe(NOT_READY.detail); // the problem's detail is what the user reads
    // The API itself answered, so it stays healthy.
    expect(text('api-status')).toContain('Healthy');
  });

  it('treats a readiness answer without a database check as unavailable', async () => {
    http.expectOne('/v1/health').flush(LIVE);
    http.expectOne('/v1/health/ready').flush({ status: 'ready', checks: {} });
    await fixture.whenStable();
    expect(text('db-status')).toContain('Unavailable');
    expect(text('db-reason')).toContain('no database check'); // the status page's own wording
  });

  it('shows the API as unavailable when it cannot be reached', async () => {
    // A network error reaches HttpClient as status 0, as when the API is not running.
    http.expectOne('/v1/health').error(new ProgressEvent('error'));
    http.expectOne('/v1/health/ready').error(new ProgressEvent('error'));
    await fixture.whenStable();
    expect(text('api-status')).toContain('Unavailable');
    expect(text('api-reason')).toContain('could not be reached'); // problemMessage wording for status 0
    expect(text('db-status')).toContain('Unavailable');
    expect(byTestId('api-version')).toBeNull();
  });

  it('says when it last checked', async () => {
    await answerBoth();
    expect(byTestId('checked-at')?.getAttribute('datetime')).toBe(CHECKED_AT.toISOString()); // the fixed CLOCK above
  });

  it('checks again when Refresh is pressed', async () => {
    await answerBoth();
    const refresh = byTestId('refresh-status') as HTMLButtonElement;
    expect(refresh.disabled).toBe(false);

    refresh.click();
    await fixture.whenStable();
    expect(text('db-status')).toContain('Checking');
    expect(refresh.disabled).toBe(true);

    http.expectOne('/v1/health').flush(LIVE);
    http
      .expectOne('/v1/health/ready')
      .flush(NOT_READY, { status: 503, statusText: 'Service Unavailable', headers: PROBLEM_HEADERS });
    await fixture.whenStable();
    expect(text('db-status')).toContain('Unavailable');
    expect(refresh.disabled).toBe(false);
  });
});
