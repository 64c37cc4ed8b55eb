import { describe, expect, it } from 'vitest';
import { backoffMs, DEFAULT_RETRY, Interrupted, retryAfterMs, withRetries } from '../../cli/batch/retry.js';
import { CliError } from '../../cli/errors.js';
import { csvRecordItem, ndjsonLineItem, stairRowHeaderProblems } from '../../shared/sizing/batch/input-items.js';
import { inlineCatalogOf, type StoredCatalogItem } from '../../shared/schemas/catalog-store.js';
import { alderRowTownhouse } from '../../shared/schemas/estimate-examples.js';

const FAST = { attempts: 4, baseDelayMs: 1, maxDelayMs: 4, maxRetryAfterMs: 5 };
const answer = (status: number, headers: Record<string, string> = {}) => new Response(status === 204 ? null : '{}', { status, headers });

describe('batch retries', () => {
  it('reads Retry-After as seconds or an HTTP date, and nothing else', () => {
    expect(retryAfterMs('1')).toBe(1000);
    expect(retryAfterMs(' 120 ')).toBe(120_000);
    const now = Date.parse('2026-12-02T12:00:00Z');
    expect(retryAfterMs('Wed, 02 Dec 2026 12:00:30 GMT', now)).toBe(30_000);
    expect(retryAfterMs('Wed, 02 Dec 2026 11:59:00 GMT', now)).toBe(0); // a date gone by: at once
    expect(retryAfterMs('soon')).toBeNull();
    expect(retryAfterMs(null)).toBeNull();
  });

  it('backs off exponentially with jitter between half and all of the step, capped', () => {
    expect(backoffMs(0, DEFAULT_RETRY, () => 0)).toBe(250);
    expect(backoffMs(0, DEFAULT_RETRY, () => 1)).toBe(500);
    expect(backoffMs(3, DEFAULT_RETRY, () => 1)).toBe(4000);
    expect(backoffMs(10, DEFAULT_RETRY, () => 1)).toBe(DEFAULT_RETRY.maxDelayMs);
    expect(backoffMs(10, DEFAULT_RETRY, () => 0)).toBe(DEFAULT_RETRY.maxDelayMs / 2);
  });

  it('retries 429 and 5xx until an answer comes, honouring Retry-After; other answers are returned at once', async () => {
    const answers = [answer(429, { 'retry-after': '0' }), answer(503), answer(502), answer(200)];
    const notices: string[] = [];
    const res = await withRetries(async () => answers.shift()!, { policy: FAST, onRetry: (n) => notices.push(`${n.attempt} ${n.reason} ${n.waitMs}`) });
    expect(res.status).toBe(200);
    expect(notices.map((n) => n.split(' ').slice(0, 3).join(' '))).toEqual(['1 HTTP 429', '2 HTTP 503', '3 HTTP 502']);
    expect(notices[0]).toBe('1 HTTP 429 0');
    let calls = 0;
    expect((await withRetries(async () => (calls++, answer(404)), { policy: FAST })).status).toBe(404);
    expect(calls).toBe(1);
  });

  it('gives up after the attempts: the last answer, or the last network failure', async () => {
    let calls = 0;
    expect((await withRetries(async () => (calls++, answer(500)), { policy: FAST })).status).toBe(500);
    expect(calls).toBe(FAST.attempts);
    calls = 0;
    await expect(
      withRetries(
        async () => {
          calls++;
          throw new CliError('cannot reach http://127.0.0.1:9 (ECONNREFUSED)');
        },
        { policy: FAST },
      ),
    ).rejects.toThrow('cannot reach');
    expect(calls).toBe(FAST.attempts);
    // A failure that is not the network is not retried.
    calls = 0;
    await expect(withRetries(async () => (calls++, Promise.reject(new CliError('bad file'))), { policy: FAST })).rejects.toThrow('bad file');
    expect(calls).toBe(1);
  });

  it('stops waiting when interrupted', async () => {
    const interrupt = new AbortController();
    const waiting = withRetries(async () => answer(503, { 'retry-after': '3600' }), { policy: { ...FAST, maxRetryAfterMs: 3_600_000 }, signal: interrupt.signal });
    interrupt.abort();
    await expect(waiting).rejects.toBeInstanceOf(Interrupted);
  });
});

describe('batch input rows', () => {
  const header = ['ref', 'layout', 'staircase.treads'];

  it('refuses a header with empty or repeated columns', () => {
    expect(stairRowHeaderProblems(['ref', 'layout'])).toEqual([]);
    expect(stairRowHeaderProblems(['ref', '', 'layout'])).toEqual(['a header cell is empty']);
    expect(stairRowHeaderProblems(['ref', 'layout', 'layout'])).toEqual(['column layout appears twice']);
  });

  it('makes a row with more cells than columns, or a bad reference, that row’s own problem', () => {
    expect(csvRecordItem(4, header, ['Plot 5', 'tread-strips', '14', 'extra'])).toMatchObject({
      index: 4,
      ref: null,
      problem: { code: 'validation_failed', errors: [{ path: '(row)', message: '4 cells under 3 columns' }] },
    });
    expect(csvRecordItem(0, header, ['x'.repeat(121), 'tread-strips', '14'])).toMatchObject({ ref: null, problem: { errors: [{ path: 'ref' }] } });
  });

  it('reads cells through the schema: guarded text unguarded, empty cells omitted, numbers typed', () => {
    const item = csvRecordItem(0, ['ref', 'layout', 'staircase.treads', 'cable.maxDropPercent'], ["'=Plot 1", 'tread-strips', 'fourteen', '']);
    expect(item.ref).toBe('=Plot 1');
    const errors = 'problem' in item ? (item.problem.errors ?? []) : [];
    expect(errors[0]).toEqual({ path: 'staircase.treads', message: 'Invalid input: expected number, received string' });
    expect(errors.map((e) => e.path)).not.toContain('cable.maxDropPercent'); // empty: omitted, the default applies
  });

  it('reads an NDJSON line as a batch item; a line that is not JSON or not an item is its own problem', () => {
    expect(ndjsonLineItem(2, JSON.stringify({ ref: 'Plot 3', request: alderRowTownhouse }))).toMatchObject({ index: 2, ref: 'Plot 3', input: { layout: 'tread-strips' } });
    expect(ndjsonLineItem(0, '{"ref": "Plot 1", ')).toMatchObject({ problem: { detail: 'The line is not valid JSON.', errors: [{ path: '(line)' }] } });
    expect(ndjsonLineItem(0, JSON.stringify({ request: alderRowTownhouse, note: 'x' }))).toMatchObject({ problem: { errors: [{ path: 'note', message: 'unknown field' }] } });
  });
});

describe('a stored catalog as the inline catalog the engine prices from', () => {
  const items = [
    { sku: 'hl-d24', kind: 'driver', unitPrice: 34.5, voltageV: 24, ratingW: 100, active: true },
    { sku: 'HL-D24-150', kind: 'driver', unitPrice: 46, voltageV: 24, ratingW: 150 },
    { sku: 'HL-OLD', kind: 'driver', unitPrice: 12, voltageV: 24, ratingW: 60, active: false },
    { sku: 'HL-C050', kind: 'cable', unitPrice: 0.6, crossSectionMm2: 0.5 },
  ] as StoredCatalogItem[];

  it('keeps the active items without `active`, by SKU in code-point order (upper case before lower), with its currency and tax', () => {
    const catalog = inlineCatalogOf(items, { currency: 'EUR', taxRatePercent: 20 });
    expect(catalog).toEqual({
      currency: 'EUR',
      taxRatePercent: 20,
      items: [
        { sku: 'HL-C050', kind: 'cable', unitPrice: 0.6, crossSectionMm2: 0.5 },
        { sku: 'HL-D24-150', kind: 'driver', unitPrice: 46, voltageV: 24, ratingW: 150 },
        { sku: 'hl-d24', kind: 'driver', unitPrice: 34.5, voltageV: 24, ratingW: 100 },
      ],
    });
  });

  it('is null when no item is active', () => {
    expect(inlineCatalogOf([items[2]!], { currency: 'EUR', taxRatePercent: 0 })).toBeNull();
  });
});
