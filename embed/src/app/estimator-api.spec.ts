import { provideZonelessChangeDetection } from '@angular/core';
import { TestBed } from '@angular/core/testing';
import { firstValueFrom } from 'rxjs';
import { beforeEach, describe, expect, it } from 'vitest';
import type { KitOptionsRequest } from './api-types.js';
import { EstimatorApi, FETCH, ShopperError } from './estimator-api.js';

const target = { apiUrl: 'https://api.treadwise.test/', embedKey: 'tw_embed_abc_secret' };
const stair: KitOptionsRequest = { layout: 'tread-strips', staircase: { treads: 14, treadWidthMm: 900, riserHeightMm: 185, goingMm: 250 }, limit: 3 };

interface Call {
  url: string;
  init: RequestInit;
}

let calls: Call[];
let answer: (call: Call) => Promise<Response>;

function api(): EstimatorApi {
  return TestBed.inject(EstimatorApi);
}

async function failure(promise: Promise<unknown>): Promise<ShopperError> {
  try {
    await promise;
  } catch (err) {
    if (err instanceof ShopperError) return err;
    throw err;
  }
  throw new Error('expected a ShopperError');
}

beforeEach(() => {
  calls = [];
  answer = async () => new Response('{}', { status: 200, headers: { 'content-type': 'application/json' } });
  TestBed.configureTestingModule({
    providers: [
      provideZonelessChangeDetection(),
      { provide: FETCH, useValue: (url: string, init: RequestInit) => { const call = { url, init }; calls.push(call); return answer(call); } },
    ],
  });
});

describe('EstimatorApi', () => {
  it('posts the stair to the options endpoint with the embed key, and no cookies', async () => {
    await firstValueFrom(api().kitOptions(target, stair));
    expect(calls[0]!.url).toBe('https://api.treadwise.test/v1/estimates/options');
    expect(calls[0]!.init.method).toBe('POST');
    expect(calls[0]!.init.credentials).toBe('omit');
    expect((calls[0]!.init.headers as Record<string, string>)['authorization']).toBe('Bearer tw_embed_abc_secret');
    expect(JSON.parse(String(calls[0]!.init.body))).toEqual(stair);
  });

  it('aborts the request on the wire when its subscriber goes (switchMap superseding it)', () => {
    answer = () => new Promise(() => undefined); // never answers
    const subscription = api().kitOptions(target, stair).subscribe();
    const signal = calls[0]!.init.signal!;
    expect(signal.aborted).toBe(false);
    subscription.unsubscribe();
    expect(signal.aborted).toBe(true);
  });

  it('reads a rate limit with its Retry-After', async () => {
    answer = async () => new Response(JSON.stringify({ code: 'rate_limited', status: 429 }), { status: 429, headers: { 'retry-after': '12' } });
    const err = await failure(firstValueFrom(api().kitOptions(target, stair)));
    expect(err.problem).toMatchObject({ kind: 'rate-limit', retryAfterS: 12 });
  });

  it('tells an origin refusal from an unreachable API when the browser hides the answer', async () => {
    // The page cannot read a refusal without CORS headers; the script's manifest, open to all, still answers.
    answer = async (call) => {
      if (call.url.endsWith('/embed/v1/manifest.json')) return new Response('{}', { status: 200 });
      throw new TypeError('Failed to fetch');
    };
    expect((await failure(firstValueFrom(api().kitOptions(target, stair)))).problem.kind).toBe('origin');
    expect(calls.at(-1)!.url).toBe('https://api.treadwise.test/embed/v1/manifest.json');

    answer = async () => {
      throw new TypeError('Failed to fetch');
    };
    expect((await failure(firstValueFrom(api().kitOptions(target, stair)))).problem.kind).toBe('unreachable');
  });

  it('lists only the strips of the shop’s catalog', async () => {
    answer = async () =>
      new Response(
        JSON.stringify({
          items: [
            { sku: 'HL-S24-10', kind: 'strip', unitPrice: 39, voltageV: 24, powerWPerM: 10, active: true },
            { sku: 'HL-D24-100', kind: 'driver', unitPrice: 34, voltageV: 24, ratingW: 100, active: true },
          ],
          nextCursor: null,
        }),
        { status: 200 },
      );
    const strips = await firstValueFrom(api().strips(target));
    expect(strips.map((s) => s.sku)).toEqual(['HL-S24-10']);
    expect(calls[0]!.url).toBe('https://api.treadwise.test/v1/catalog/items?kind=strip&limit=100');
  });
});
