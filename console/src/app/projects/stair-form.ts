import { type AbstractControl, FormArray, FormControl, FormGroup, type ValidationErrors, type ValidatorFn, Validators } from '@angular/forms';

import { flightsMismatch } from '../../../../shared/tables/stair-flights.js';
import type { EstimateRequest, Staircase } from '../core/api-types.js';
import { NAME_MAX, PROFILE_ID_MAX, STAIR_BOUNDS, type NumberBound, type StairBoundName } from './stair-bounds.js';

export type ControllerPlace = 'auto' | 'bottom' | 'middle' | 'top' | 'tread';

/** A flight, and whether the landing at its head is lit (the last flight has no landing above it). */
export type FlightGroup = FormGroup<{
  treads: FormControl<number | null>;
  landingLengthMm: FormControl<number | null>;
  landingLit: FormControl<boolean>;
}>;

export type StairForm = FormGroup<{
  name: FormControl<string>;
  treads: FormControl<number | null>;
  treadWidthMm: FormControl<number | null>;
  riserHeightMm: FormControl<number | null>;
  goingMm: FormControl<number | null>;
  flights: FormArray<FlightGroup>;
  strip: FormGroup<{
    voltageV: FormControl<number | null>;
    powerWPerM: FormControl<number | null>;
    cutPitchMm: FormControl<number | null>;
    endClearanceMm: FormControl<number | null>;
  }>;
  profileId: FormControl<string>;
  place: FormControl<ControllerPlace>;
  placeTread: FormControl<number | null>;
}>;

export type StairFormValue = ReturnType<StairForm['getRawValue']>;

/** A number within one of the API's bounds; the error names the bound so the message can quote it. */
export function withinBound(name: StairBoundName): ValidatorFn {
  const bound: NumberBound = STAIR_BOUNDS[name];
  return (control: AbstractControl): ValidationErrors | null => {
    const raw: unknown = control.value;
    if (raw === null || raw === undefined || raw === '') return null; // `required` speaks for empty fields
    const value = Number(raw);
    if (!Number.isFinite(value)) return { bound: name };
    if (bound.integer && !Number.isInteger(value)) return { bound: name };
    if (bound.exclusiveMin ? value <= bound.min : value < bound.min) return { bound: name };
    if (value > bound.max) return { bound: name };
    return null;
  };
}

/** What the field beside a failed bound says. */
export function boundMessage(name: StairBoundName): string {
  const bound: NumberBound = STAIR_BOUNDS[name];
  const whole = bound.integer ? 'A whole number ' : '';
  if (bound.exclusiveMin) return `${whole || 'A number '}above ${bound.min} and at most ${bound.max.toLocaleString('en')}.`;
  return `${whole || ''}${whole ? 'from' : 'From'} ${bound.min} to ${bound.max.toLocaleString('en')}.`;
}

function numberControl(name: StairBoundName, value: number | null, required = true): FormControl<number | null> {
  return new FormControl<number | null>(value, required ? [Validators.required, withinBound(name)] : [withinBound(name)]);
}

/** Characters the API's nameText refuses: control characters and bidirectional overrides. */
// eslint-disable-next-line no-control-regex
const NAME_BREAKERS = /[\u0000-\u001f\u007f-\u009f\u202a-\u202e\u2066-\u2069]/;

const oneLineName: ValidatorFn = (control) => (typeof control.value === 'string' && NAME_BREAKERS.test(control.value) ? { oneLine: true } : null);
const notBlank: ValidatorFn = (control) => (typeof control.value === 'string' && control.value.trim() === '' ? { required: true } : null);

/** The cross-field rules of staircaseSchema and the request's crossCheck. */
const stairRules: ValidatorFn = (group: AbstractControl): ValidationErrors | null => {
  const value = (group as StairForm).getRawValue();
  const errors: ValidationErrors = {};
  if (value.treads !== null && value.flights.length > 0 && value.flights.every((f) => f.treads !== null)) {
    const issue = flightsMismatch({ treads: Number(value.treads), flights: value.flights.map((f) => ({ treads: Number(f.treads) })) });
    if (issue) errors['flights'] = issue;
  }
  if (value.place === 'tread') {
    if (value.placeTread === null) errors['placeTread'] = 'Give the tread the controller sits at.';
    else if (value.treads !== null && Number(value.placeTread) > Number(value.treads)) errors['placeTread'] = `must be a tread from 1 to ${value.treads}`;
  }
  return Object.keys(errors).length > 0 ? errors : null;
};

export function flightGroup(treads: number | null, landingLengthMm: number | null = null, landingLit = false): FlightGroup {
  return new FormGroup({
    treads: numberControl('flightTreads', treads),
    landingLengthMm: numberControl('landingLengthMm', landingLengthMm, false),
    landingLit: new FormControl(landingLit, { nonNullable: true }),
  });
}

/** A new stair starts as one straight flight with the demo shop's 24 V strip and controller. */
export const NEW_STAIR: EstimateRequest = {
  layout: 'tread-strips',
  staircase: { treads: 14, treadWidthMm: 900, riserHeightMm: 185, goingMm: 250 },
  treadStrip: { voltageV: 24, powerWPerM: 10, cutPitchMm: 50 },
  controller: { profileId: 'HL-K20' },
};

function placeOf(input: EstimateRequest): { place: ControllerPlace; placeTread: number | null } {
  const position = input.controller.position;
  if (position === undefined) return { place: 'auto', placeTread: null };
  if (typeof position === 'string') return { place: position, placeTread: null };
  return { place: 'tread', placeTread: position.tread };
}

/** The editor's form, filled from a stored request. */
export function stairForm(name: string, input: EstimateRequest): StairForm {
  const stair: Partial<Staircase> = input.staircase ?? {};
  const strip = 'treadStrip' in input ? input.treadStrip : undefined;
  const lit = new Set(stair.litLandings ?? []);
  const { place, placeTread } = placeOf(input);
  return new FormGroup(
    {
      name: new FormControl(name, { nonNullable: true, validators: [Validators.required, notBlank, Validators.maxLength(NAME_MAX), oneLineName] }),
      treads: numberControl('treads', stair.treads ?? null),
      treadWidthMm: numberControl('treadWidthMm', stair.treadWidthMm ?? null),
      riserHeightMm: numberControl('riserHeightMm', stair.riserHeightMm ?? null),
      goingMm: numberControl('goingMm', stair.goingMm ?? null),
      flights: new FormArray((stair.flights ?? []).map((f, i) => flightGroup(f.treads, f.landingLengthMm ?? null, lit.has(i + 1)))),
      strip: new FormGroup({
        voltageV: numberControl('voltageV', strip?.voltageV ?? null, strip !== undefined),
        powerWPerM: numberControl('powerWPerM', strip?.powerWPerM ?? null, strip !== undefined),
        cutPitchMm: numberControl('cutPitchMm', strip?.cutPitchMm ?? null, strip !== undefined),
        endClearanceMm: numberControl('endClearanceMm', strip?.endClearanceMm ?? null, false),
      }),
      profileId: new FormControl(input.controller.profileId ?? '', {
        nonNullable: true,
        validators: input.controller.profile ? [] : [Validators.required, notBlank, Validators.maxLength(PROFILE_ID_MAX)],
      }),
      place: new FormControl<ControllerPlace>(place, { nonNullable: true }),
      placeTread: numberControl('controllerTread', placeTread, false),
    },
    { validators: stairRules },
  );
}

const num = (v: number | null): number => Number(v);
const optional = (v: number | null): number | undefined => (v === null || (v as unknown) === '' ? undefined : Number(v));

/** The staircase block of the form, as the API takes it (without the request's other stair fields). */
export function staircaseOf(value: StairFormValue, base?: Partial<Staircase>): Staircase {
  const treads = num(value.treads);
  const flights = value.flights.map((f) => ({ treads: num(f.treads), ...(optional(f.landingLengthMm) === undefined ? {} : { landingLengthMm: optional(f.landingLengthMm) }) }));
  const litLandings = value.flights.slice(0, -1).flatMap((f, i) => (f.landingLit ? [i + 1] : []));
  return {
    treads,
    treadWidthMm: num(value.treadWidthMm),
    riserHeightMm: num(value.riserHeightMm),
    goingMm: num(value.goingMm),
    ...(flights.length > 0 ? { flights } : {}),
    // Per-tread widths stay only while they still count one per tread.
    ...(base?.treadWidthsMm && base.treadWidthsMm.length === treads ? { treadWidthsMm: base.treadWidthsMm } : {}),
    ...(litLandings.length > 0 ? { litLandings } : {}),
  };
}

/**
 * The stored request with the form's changes: the stair, the strip and the controller; every other
 * choice of the request (cable, drivers, sensors, catalog …) stays as it was.
 */
export function requestOf(value: StairFormValue, base: EstimateRequest): EstimateRequest {
  const controller = { ...base.controller };
  if (!controller.profile) controller.profileId = value.profileId.trim();
  delete controller.position;
  if (value.place === 'tread') controller.position = { tread: num(value.placeTread) };
  else if (value.place !== 'auto') controller.position = value.place;
  const next = { ...base, staircase: staircaseOf(value, base.staircase), controller } as EstimateRequest;
  if ('treadStrip' in next && next.treadStrip) {
    const { endClearanceMm: _dropped, ...kept } = next.treadStrip;
    const clearance = optional(value.strip.endClearanceMm);
    next.treadStrip = {
      ...kept,
      voltageV: num(value.strip.voltageV),
      powerWPerM: num(value.strip.powerWPerM),
      cutPitchMm: num(value.strip.cutPitchMm),
      ...(clearance === undefined ? {} : { endClearanceMm: clearance }),
    };
  }
  return next;
}

/** Whether the layout fits a strip on every tread, so the editor shows the strip fields. */
export function hasTreadStrip(input: EstimateRequest): boolean {
  return 'treadStrip' in input && input.treadStrip !== undefined;
}
