import { describe, expect, it } from 'vitest';

import { createStairSchema } from '../../../../shared/schemas/projects.js';
import { estimateRequestSchema } from '../../../../shared/schemas/estimate.js';
import type { EstimateRequest } from '../core/api-types.js';
import { SALTMARSH_INPUT } from './saltmarsh-fixtures.js';
import { STAIR_BOUNDS, type StairBoundName } from './stair-bounds.js';
import { requestOf, stairForm } from './stair-form.js';

const SALTMARSH = SALTMARSH_INPUT; // the request the editor starts from

type Path = (string | number)[];

/** Puts `value` into a copy of the request where the bound applies, and names the path the API checks. */
function place(name: StairBoundName, value: number): { request: EstimateRequest; path: Path } {
  const request = structuredClone(SALTMARSH) as EstimateRequest & { staircase: Record<string, unknown>; treadStrip: Record<string, unknown> };
  switch (name) {
    case 'treads':
    case 'treadWidthMm':
    case 'riserHeightMm':
    case 'goingMm':
      request.staircase[name] = value;
      return { request, path: ['staircase', name] };
    case 'flightTreads':
      request.staircase['flights'] = [{ treads: value }, { treads: 1 }];
      request.staircase['treads'] = Math.min(200, Math.max(1, Math.round(value) + 1));
      return { request, path: ['staircase', 'flights', 0, 'treads'] };
    case 'landingLengthMm':
      request.staircase['flights'] = [{ treads: 6, landingLengthMm: value }, { treads: 6 }];
      return { request, path: ['staircase', 'flights', 0, 'landingLengthMm'] };
    case 'voltageV':
    case 'powerWPerM':
    case 'cutPitchMm':
    case 'endClearanceMm':
      request.treadStrip[name] = value;
      return { request, path: ['treadStrip', name] };
    case 'controllerTread':
      request.staircase['treads'] = 200;
      request.controller = { ...request.controller, position: { tread: value } };
      return { request, path: ['controller', 'position'] };
  }
}

/** The API refuses the request at this path (or below it). */
function apiRefuses(request: unknown, path: Path): boolean {
  const parsed = estimateRequestSchema.safeParse(request);
  if (parsed.success) return false;
  return parsed.error.issues.some((issue) => path.every((part, i) => issue.path[i] === part));
}

/** The editor's control for the bound, holding `value`, shows its bound error. */
function editorRefuses(name: StairBoundName, value: number): boolean {
  const { request } = place(name, value);
  const form = stairForm('Main stair', request);
  const c = form.controls;
  const control = (() => {
    switch (name) {
      case 'flightTreads':
        return c.flights.at(0).controls.treads;
      case 'landingLengthMm':
        return c.flights.at(0).controls.landingLengthMm;
      case 'voltageV':
      case 'powerWPerM':
      case 'cutPitchMm':
      case 'endClearanceMm':
        return c.strip.controls[name];
      case 'controllerTread':
        return c.placeTread;
      default:
        return c[name];
    }
  })();
  return control.hasError('bound');
}

/** Values at, inside and just outside each bound, and a fraction for whole-number fields. */
function probes(name: StairBoundName): number[] {
  const b: { min: number; max: number; integer?: boolean } = STAIR_BOUNDS[name];
  const step = b.integer ? 1 : 0.001;
  const values = [b.min, b.min - step, b.min + step, b.max, b.max + step, b.max - step];
  if (b.integer) values.push(b.min + 0.5);
  return values;
}

describe('the stair editor’s bounds', () => {
  const names = Object.keys(STAIR_BOUNDS) as StairBoundName[];

  it.each(names)('agree with the API’s schema on %s', (name) => {
    for (const value of probes(name)) {
      const { request, path } = place(name, value);
      expect({ name, value, refused: editorRefuses(name, value) }).toEqual({ name, value, refused: apiRefuses(request, path) });
    }
  });

  it('refuses a stair name the API refuses', () => {
    for (const name of ['Main stair', 'x'.repeat(120), 'x'.repeat(121), '   ', 'Main\u202estair', 'line\nbreak']) {
      const form = stairForm(name, SALTMARSH);
      const api = createStairSchema.safeParse({ name, input: SALTMARSH }).success;
      expect({ name, valid: form.controls.name.valid }).toEqual({ name, valid: api });
    }
  });

  it('says what the API says when the flights do not add up to the treads', () => {
    const request = structuredClone(SALTMARSH);
    request.staircase = { ...request.staircase!, flights: [{ treads: 7 }, { treads: 6 }] };
    const form = stairForm('Main stair', request);
    const parsed = estimateRequestSchema.safeParse(request);
    expect(parsed.success).toBe(false);
    expect(form.getError('flights')).toBe(parsed.error!.issues.find((i) => i.path.join('.') === 'staircase.flights')!.message);
  });

  it('refuses a controller tread beyond the stair, as the API does', () => {
    const request = structuredClone(SALTMARSH);
    request.controller = { profileId: 'HL-K20', position: { tread: 13 } };
    expect(estimateRequestSchema.safeParse(request).success).toBe(false);
    expect(stairForm('Main stair', request).hasError('placeTread')).toBe(true);
  });
});

describe('requestOf', () => {
  it('gives back the stored request when nothing was edited', () => {
    const form = stairForm('Main stair', SALTMARSH);
    expect(requestOf(form.getRawValue(), SALTMARSH)).toEqual(SALTMARSH);
  });

  it('carries the edits and keeps every other choice of the request', () => {
    const form = stairForm('Main stair', SALTMARSH);
    form.controls.treads.setValue(15);
    form.controls.strip.controls.powerWPerM.setValue(14.4);
    form.controls.place.setValue('middle');
    const next = requestOf(form.getRawValue(), SALTMARSH);
    expect(next.staircase?.treads).toBe(15);
    expect(next.controller).toEqual({ profileId: 'HL-K20', position: 'middle' });
    expect(next).toMatchObject({ treadStrip: { powerWPerM: 14.4, sku: 'HL-S24-10' }, sensors: SALTMARSH.sensors });
    expect(estimateRequestSchema.safeParse(next).success).toBe(true);
  });

  it('writes lit landings for the flights whose landing is ticked', () => {
    const request: EstimateRequest = { ...SALTMARSH, staircase: { ...SALTMARSH.staircase!, flights: [{ treads: 6, landingLengthMm: 900 }, { treads: 6 }], litLandings: [1] } };
    const form = stairForm('Main stair', request);
    expect(form.controls.flights.at(0).controls.landingLit.value).toBe(true);
    expect(requestOf(form.getRawValue(), request).staircase).toEqual(request.staircase);
  });
});
