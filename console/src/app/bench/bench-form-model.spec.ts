import { describe, expect, it } from 'vitest';

import { BENCH_CALCULATORS } from './bench-calculators.js';
import { initialValues, problemFieldErrors, requestBody, validate } from './bench-form-model.js';

const calc = (id: string) => BENCH_CALCULATORS.find((c) => c.id === id)!;

function check(id: string, changes: Record<string, string | boolean>) {
  const c = calc(id);
  const { body, errors } = requestBody(c.fields, { ...initialValues(c.fields), ...changes });
  return { body, errors: { ...validate(c, body), ...errors } };
}

describe('bench forms', () => {
  it.each(BENCH_CALCULATORS.map((c) => c.id))('starts the %s form with values the API accepts', (id) => {
    expect(check(id, {}).errors).toEqual({});
  });

  it('sends only the fields filled in, nested where the API nests them', () => {
    expect(check('voltage-drop', {}).body).toEqual({ supplyVoltageV: 24, currentA: 0.354, lengthM: 2.68, conductor: { crossSectionMm2: 0.5 } });
    expect(check('driver', { class2: true }).body).toMatchObject({ availableRatingsW: [60, 100, 150, 240], class2: true });
    expect(check('pixels', { bitsPerPixel: '32' }).body).toMatchObject({ bitsPerPixel: 32 });
  });

  // Bounds from shared/schemas: supplyVoltageSchema 1–1000 V, currentSchema > 0, maxDropPercentSchema 0.1–50.
  it('puts the schema bounds beside their fields', () => {
    expect(check('voltage-drop', { supplyVoltageV: '0.5' }).errors).toEqual({ supplyVoltageV: 'At least 1.' });
    expect(check('voltage-drop', { supplyVoltageV: '1200' }).errors).toEqual({ supplyVoltageV: 'At most 1000.' });
    expect(check('voltage-drop', { currentA: '0' }).errors).toEqual({ currentA: 'More than 0.' });
    expect(check('cable', { maxDropPercent: '60' }).errors).toEqual({ maxDropPercent: 'At most 50.' });
  });

  it('asks for a required field left empty', () => {
    expect(check('driver', { loadW: '' }).errors).toEqual({ loadW: 'Needed.' });
  });

  it('says a field is not a number before asking the API', () => {
    expect(check('voltage-drop', { lengthM: 'three' }).errors).toMatchObject({ lengthM: 'A number, please.' });
    expect(check('reels', { piecesMm: '850, x' }).errors).toMatchObject({ piecesMm: 'Numbers only, separated by commas or spaces.' });
  });

  it('wants one conductor size, by mm² or AWG, not both', () => {
    expect(check('voltage-drop', { 'conductor.awg': '18' }).errors).toEqual({ 'conductor.crossSectionMm2': 'Give one of these, not both or neither.' });
    expect(check('voltage-drop', { 'conductor.crossSectionMm2': '', 'conductor.awg': '18' }).errors).toEqual({});
  });

  it('checks whole numbers where the API wants them', () => {
    expect(check('pixels', { pixels: '10.5' }).errors).toEqual({ pixels: 'A whole number.' });
  });

  it('uses the schema’s own cross-field checks: a piece longer than a reel', () => {
    const { errors } = check('reels', { piecesMm: '850, 5200' });
    expect(errors['piecesMm']).toContain('does not fit');
  });

  it('places the API’s own 400 errors beside the fields they name', () => {
    const fields = calc('voltage-drop').fields;
    expect(problemFieldErrors(fields, [{ path: 'conductor.crossSectionMm2', message: 'not in the table' }, { path: 'somethingElse', message: 'odd' }])).toEqual({
      'conductor.crossSectionMm2': 'not in the table',
      '': 'odd',
    });
  });
});
