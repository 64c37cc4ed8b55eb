import { MAX_FLIGHTS, MAX_TREADS } from '../../../shared/tables/limits.js';
import type { KitOptionsRequest } from './api-types.js';

/** The form as typed: strings, so a half-typed number is kept rather than lost. */
export interface StairDraft {
  treads: string;
  treadWidthMm: string;
  riserHeightMm: string;
  goingMm: string;
  /** Treads per flight, foot first ("7 + 8"); empty for one straight flight. */
  flights: string;
  /** Cable length across each landing, mm; empty for the API's default (the tread width). */
  landingLengthMm: string;
  /** The strip the shopper chose; empty: any strip the shop offers. */
  stripSku: string;
}

export type DraftField = keyof StairDraft;

export const EMPTY_DRAFT: StairDraft = { treads: '', treadWidthMm: '', riserHeightMm: '', goingMm: '', flights: '', landingLengthMm: '', stripSku: '' };

export interface DraftReading {
  /** The request to send, or null while something required is missing or wrong. */
  request: KitOptionsRequest | null;
  /** What is wrong with a field, in plain words (empty fields are not errors: the shopper is still typing). */
  errors: Partial<Record<DraftField, string>>;
  /** Required fields still empty. */
  missing: DraftField[];
}

/** Designs the shopper is offered, cheapest first. */
export const KIT_CHOICES = 3;

const REQUIRED: DraftField[] = ['treads', 'treadWidthMm', 'riserHeightMm', 'goingMm'];

function positive(text: string): number | undefined {
  const n = Number(text.trim().replace(',', '.'));
  return Number.isFinite(n) && n > 0 ? n : undefined;
}

/**
 * Reads the draft into a kit-options request. Only what a shopper can get wrong while typing is
 * checked here (numbers, whole treads, flights adding up); the API's own bounds answer the rest
 * as field errors the element shows beside the field.
 */
export function readDraft(draft: StairDraft, offeredStripSkus: readonly string[] = []): DraftReading {
  const errors: DraftReading['errors'] = {};
  const missing = REQUIRED.filter((f) => draft[f].trim() === '');
  const number = (field: DraftField) => {
    if (draft[field].trim() === '') return undefined;
    const n = positive(draft[field]);
    if (n === undefined) errors[field] = 'Enter a number above zero.';
    return n;
  };
  const treads = number('treads');
  if (treads !== undefined && (!Number.isInteger(treads) || treads > MAX_TREADS)) errors.treads = `Enter a whole number of treads, at most ${MAX_TREADS}.`;
  const treadWidthMm = number('treadWidthMm');
  const riserHeightMm = number('riserHeightMm');
  const goingMm = number('goingMm');
  const landingLengthMm = number('landingLengthMm');

  let flights: { treads: number; landingLengthMm?: number }[] | undefined;
  if (draft.flights.trim() !== '') {
    const parts = draft.flights.split(/[+,;\s]+/).filter(Boolean);
    const counts = parts.map(Number);
    if (counts.some((n) => !Number.isInteger(n) || n < 1)) errors.flights = 'List the treads of each flight, foot first, e.g. 7 + 8.';
    else if (counts.length > MAX_FLIGHTS) errors.flights = `At most ${MAX_FLIGHTS} flights.`;
    else if (treads !== undefined && !errors.treads && counts.reduce((a, b) => a + b, 0) !== treads) {
      errors.flights = `The flights add up to ${counts.reduce((a, b) => a + b, 0)} treads, but the stair has ${treads}.`;
    } else if (counts.length > 1) {
      // The landing length belongs to the landing at the head of each flight but the last.
      flights = counts.map((n, i) => (landingLengthMm !== undefined && i < counts.length - 1 ? { treads: n, landingLengthMm } : { treads: n }));
    }
  }

  if (missing.length || Object.keys(errors).length) return { request: null, errors, missing };
  const stripSkus = draft.stripSku ? [draft.stripSku] : offeredStripSkus.length ? [...offeredStripSkus] : undefined;
  const request: KitOptionsRequest = {
    layout: 'tread-strips',
    staircase: { treads: treads!, treadWidthMm: treadWidthMm!, riserHeightMm: riserHeightMm!, goingMm: goingMm!, ...(flights ? { flights } : {}) },
    limit: KIT_CHOICES,
    ...(stripSkus ? { constraints: { stripSkus } } : {}),
  };
  return { request, errors, missing };
}

/** The form field an API field error is about (`staircase.flights.0.treads` → flights). */
export function fieldOfPath(path: string): DraftField | undefined {
  const [first, second] = path.split('.');
  if (first === 'staircase') {
    if (second === 'flights') return 'flights';
    if (second === 'treads' || second === 'treadWidthMm' || second === 'riserHeightMm' || second === 'goingMm') return second;
  }
  if (first === 'constraints') return 'stripSku';
  return undefined;
}

/** A space- or comma-separated attribute as a list (`strip-skus="HL-S24-10 HL-S12-07"`). */
export function listAttribute(value: string | null | undefined): string[] {
  return (value ?? '').split(/[\s,]+/).filter(Boolean);
}
