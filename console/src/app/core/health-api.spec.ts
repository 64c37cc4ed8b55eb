import { HttpErrorResponse, provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { provideZonelessChangeDetection } from '@angular/core';
import { TestBed } from '@angular/core/testing';
import { firstValueFrom } from 'rxjs';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';

import { HealthApi, type Health, type Readiness } from './health-api.js';

// Shaped as the API's health contract describes; the values are invented for these tests.
const LIVE: Health = {
  status: 'ok',
  service: 'treadwise-api',
  version: '0.1.0',
  engineVersion: '1.0.0',
  time: '2026-03-14T18:30:00.000Z',
};
const READY: Readiness = { status: 'ready', checks: { database: 'ok' } };

describe('HealthApi', () => {
  let healthApi: HealthApi;
  let http: HttpTestingController;

  beforeEach(() => {
    TestBed.configureTestingModule({
      providers: [provideZonelessChangeDetection(), provideHttpClient(), provideHttpClientTesting()],
    });
    healthApi = TestBed.inject(HealthApi);
    http = TestBed.inject(HttpTestingController);
  });

  afterEach(() => http.verify());

  it('asks GET /v1/health whether the API is alive', async () => {
    const answer = firstValueFrom(healthApi.liveness());
    const request = http.expectOne('/v1/health');
    expect(request.request.method).toBe('GET'); // health contract: GET /v1/health
    request.flush(LIVE);
    expect(await answer).toEqual(LIVE);
  });

  it('asks GET /v1/health/ready whether the API is ready', async () => {
    const answer = firstValueFrom(healthApi.readiness());
    const request = http.expectOne('/v1/health/ready');
    expect(request.request.method).toBe('GET'); // health contract: GET /v1/health/ready
    request.flush(READY);
    expect(await answer).toEqual(READY);
  });

  it('passes a 503 from readiness on as an error that carries the problem body', async () => {
    const problem = { title: 'Not ready', status: 503, detail: 'Database unreachable.', code: 'not_ready' };
    const answer = firstValueFrom(healthApi.readiness()).catch((error: unknown) => error);
    http.expectOne('/v1/health/ready').flush(problem, { status: 503, statusText: 'Service Unavailable' });
    const error = await answer;
    expect(error).toBeInstanceOf(HttpErrorResponse);
    expect((error as HttpErrorResponse).status).toBe(503); // flushed above
    expect((error as HttpErrorResponse).error).toEqual(problem);
  });
});
